namespace OpsLvp.Core.Readings;

/// <summary>The sensor's own quality flag. Only <see cref="Ok"/> readings can reach the engine (docs/engine.md R1).</summary>
public enum ReadingStatus
{
    Ok,
    Degraded,
    Failed,
    Maintenance,
}
