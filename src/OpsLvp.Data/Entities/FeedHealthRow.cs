namespace OpsLvp.Data.Entities;

/// <summary>Row of <c>feed_health</c>: one per feed.</summary>
public sealed class FeedHealthRow
{
    public required string Feed { get; set; }

    public DateTimeOffset? LastGoodAt { get; set; }

    public int ConsecutiveFailures { get; set; }

    public string? LastError { get; set; }

    public DateTimeOffset? LastErrorAt { get; set; }
}
