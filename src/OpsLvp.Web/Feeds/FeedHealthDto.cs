namespace OpsLvp.Web.Feeds;

/// <summary>One feed in the <c>/health</c> response; <c>status</c> is <c>ok</c>, <c>degraded</c> or <c>down</c>.</summary>
public sealed record FeedHealthDto(
    string Name,
    string Kind,
    string Status,
    string? Detail,
    DateTimeOffset? LastGoodAt,
    DateTimeOffset? LastAttemptAt,
    int ConsecutiveFailures,
    string? LastError,
    DateTimeOffset? LastErrorAt,
    int LastAccepted,
    int LastRejected,
    long TotalAccepted,
    long TotalRejected,
    long TotalFailures)
{
    public static FeedHealthDto From(FeedHealth h) => new(
        h.Name, h.Kind, StatusText(h.Status), h.StatusDetail, h.LastGoodAt, h.LastAttemptAt, h.ConsecutiveFailures,
        h.LastError, h.LastErrorAt, h.LastAccepted, h.LastRejected, h.TotalAccepted, h.TotalRejected, h.TotalFailures);

    public static string StatusText(FeedStatus status) => status switch
    {
        FeedStatus.Ok => "ok",
        FeedStatus.Degraded => "degraded",
        _ => "down",
    };
}
