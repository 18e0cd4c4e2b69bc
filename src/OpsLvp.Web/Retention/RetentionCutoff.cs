namespace OpsLvp.Web.Retention;

/// <summary>
/// Which readings a pruning run may remove (docs/retention.md "What is never pruned"): those received before
/// now − <c>Retention:ReadingsDays</c>, and, while an episode is open, before its start less
/// <see cref="EpisodeMargin"/>, so an open episode's review keeps the readings that led into it. The engine's restore
/// needs only the last 10 minutes (RVR means and tendencies), far inside the minimum of one day.
/// </summary>
public static class RetentionCutoff
{
    /// <summary>Readings this long before an open episode's start are kept with it.</summary>
    public static readonly TimeSpan EpisodeMargin = TimeSpan.FromHours(1);

    /// <summary>The receipt time before which readings may be pruned; null when retention is off (0 days).</summary>
    public static DateTimeOffset? Compute(DateTimeOffset now, int readingsDays, DateTimeOffset? openEpisodeStart)
    {
        if (readingsDays <= 0)
        {
            return null;
        }
        var cutoff = now - TimeSpan.FromDays(readingsDays);
        if (openEpisodeStart is { } start && start - EpisodeMargin < cutoff)
        {
            cutoff = start - EpisodeMargin;
        }
        return cutoff;
    }
}
