namespace OpsLvp.Web.Feeds;

/// <summary>The documented health rule (docs/feeds.md, "Health"), first match wins.</summary>
public static class FeedHealthRules
{
    /// <summary>Consecutive failed polls or deliveries after which a feed that once worked is down.</summary>
    public const int DownAfterFailures = 3;

    /// <summary>
    /// down: never delivered and the last attempt failed, or <see cref="DownAfterFailures"/> or more failures in a row;
    /// degraded: 1–2 failures in a row, nothing delivered yet, last good delivery older than its stale window,
    /// or the last good delivery had rejected items; ok: otherwise.
    /// </summary>
    public static (FeedStatus Status, string? Detail) Evaluate(
        DateTimeOffset? lastGoodAt, int consecutiveFailures, int lastRejected, TimeSpan? staleAfter, DateTimeOffset now)
    {
        if (lastGoodAt is null && consecutiveFailures > 0)
        {
            return (FeedStatus.Down, "no good delivery yet; last attempt failed");
        }

        if (consecutiveFailures >= DownAfterFailures)
        {
            return (FeedStatus.Down, $"{consecutiveFailures} failures in a row");
        }

        if (consecutiveFailures > 0)
        {
            return (FeedStatus.Degraded, $"{consecutiveFailures} failure(s) in a row");
        }

        if (lastGoodAt is null)
        {
            return (FeedStatus.Degraded, "awaiting first delivery");
        }

        if (staleAfter is { } stale && now - lastGoodAt.Value > stale)
        {
            return (FeedStatus.Degraded, "stale: no good delivery within " + stale.ToString("c", System.Globalization.CultureInfo.InvariantCulture));
        }

        if (lastRejected > 0)
        {
            return (FeedStatus.Degraded, $"last delivery had {lastRejected} rejected item(s)");
        }

        return (FeedStatus.Ok, null);
    }
}
