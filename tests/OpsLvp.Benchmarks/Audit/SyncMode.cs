namespace OpsLvp.Benchmarks.Audit;

/// <summary>SQLite <c>PRAGMA synchronous</c> setting under WAL: FULL is the product's; NORMAL is measured for comparison.</summary>
public enum SyncMode
{
    Full,
    Normal,
}
