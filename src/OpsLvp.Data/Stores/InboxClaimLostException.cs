namespace OpsLvp.Data.Stores;

/// <summary>
/// An insert claimed <c>reading_inbox</c> rows that are no longer there (another node stored them first): nothing was
/// written, so no reading is stored twice (docs/engine.md R74).
/// </summary>
public sealed class InboxClaimLostException(int claimed, int found) : Exception(
    $"readings not stored: {claimed} inbox row(s) claimed but only {found} still waiting; another node has stored them")
{
    public int Claimed { get; } = claimed;

    public int Found { get; } = found;
}
