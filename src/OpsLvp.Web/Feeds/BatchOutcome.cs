namespace OpsLvp.Web.Feeds;

/// <summary>What became of a batch: <paramref name="Stored"/> durably, or not, and then why (<paramref name="Reason"/>).</summary>
public sealed record BatchOutcome(bool Stored, string? Reason)
{
    public static readonly BatchOutcome Recorded = new(true, null);
}
