namespace OpsLvp.Data.Stores;

/// <summary>Health of one feed: last good poll, failures since, last error.</summary>
public sealed record FeedHealth(string Feed, DateTimeOffset? LastGoodAt, int ConsecutiveFailures, string? LastError, DateTimeOffset? LastErrorAt);
