namespace OpsLvp.Data.Stores;

/// <summary>
/// An engine append carried a leadership epoch that is no longer the current one in <c>engine_leadership</c>: another
/// node has taken leadership since. Nothing of the append was written (docs/engine.md R70, R71); the node must step
/// down and stop evaluating.
/// </summary>
public sealed class StaleEpochException(long epoch, long? current) : Exception(
    current is null
        ? $"append refused: this node's leadership epoch {epoch} is not on record (no leadership row); another node leads or none has taken over"
        : $"append refused: this node's leadership epoch {epoch} is stale, the current epoch is {current}; another node has taken leadership")
{
    /// <summary>The epoch the append carried.</summary>
    public long Epoch { get; } = epoch;

    /// <summary>The epoch on record when it was refused; null when there is none.</summary>
    public long? Current { get; } = current;
}
