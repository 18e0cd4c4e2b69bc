namespace OpsLvp.Data.Stores;

/// <summary>
/// Signs the engine state row with the key kept outside the database (docs/audit.md "State seal"), called inside
/// the append's transaction with the head the commit leaves.
/// </summary>
public interface IStateSealer
{
    /// <summary>The signature to store with the row; null when no key is available.</summary>
    string? Seal(long sequence, string? hash, string stateJson, string profileVersion);
}
