namespace OpsLvp.Web.Feeds;

/// <summary>
/// Snapshot of one feed's health. Times are app-clock (demo time in demo mode). <c>Last*</c> counts are of
/// the last good delivery; <c>Total*</c> since start.
/// </summary>
public sealed record FeedHealth(
    string Name,
    string Kind,
    FeedStatus Status,
    string? StatusDetail,
    DateTimeOffset? LastGoodAt,
    DateTimeOffset? LastAttemptAt,
    int ConsecutiveFailures,
    string? LastError,
    DateTimeOffset? LastErrorAt,
    int LastAccepted,
    int LastRejected,
    long TotalAccepted,
    long TotalRejected,
    long TotalFailures,
    TimeSpan? StaleAfter);
