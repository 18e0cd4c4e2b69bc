namespace OpsLvp.Web.Feeds;

/// <summary>Per-feed health, written by the feeds and read by <c>/health</c> and the UI. Thread-safe.</summary>
public sealed class FeedHealthRegistry(TimeProvider time)
{
    private readonly Lock _lock = new();
    private readonly Dictionary<string, Entry> _entries = new(StringComparer.Ordinal);

    /// <summary>Adds a feed (or updates its kind and stale window) so it is reported before its first delivery.</summary>
    public void Register(string name, string kind, TimeSpan? staleAfter = null)
    {
        lock (_lock)
        {
            var entry = GetOrAdd(name, kind);
            entry.Kind = kind;
            entry.StaleAfter = staleAfter;
        }
    }

    public void RecordSuccess(string name, int accepted, int rejected)
    {
        var now = time.GetUtcNow();
        lock (_lock)
        {
            var entry = GetOrAdd(name, "unknown");
            entry.LastAttemptAt = now;
            entry.LastGoodAt = now;
            entry.ConsecutiveFailures = 0;
            entry.LastAccepted = accepted;
            entry.LastRejected = rejected;
            entry.TotalAccepted += accepted;
            entry.TotalRejected += rejected;
        }
    }

    public void RecordFailure(string name, string error)
    {
        var now = time.GetUtcNow();
        lock (_lock)
        {
            var entry = GetOrAdd(name, "unknown");
            entry.LastAttemptAt = now;
            entry.LastError = error;
            entry.LastErrorAt = now;
            entry.ConsecutiveFailures++;
            entry.TotalFailures++;
        }
    }

    public FeedHealth? Get(string name)
    {
        var now = time.GetUtcNow();
        lock (_lock)
        {
            return _entries.TryGetValue(name, out var entry) ? entry.ToHealth(name, now) : null;
        }
    }

    /// <summary>All feeds, ordered by name.</summary>
    public IReadOnlyList<FeedHealth> Snapshot()
    {
        var now = time.GetUtcNow();
        lock (_lock)
        {
            return _entries.OrderBy(e => e.Key, StringComparer.Ordinal).Select(e => e.Value.ToHealth(e.Key, now)).ToList();
        }
    }

    private Entry GetOrAdd(string name, string kind)
    {
        if (!_entries.TryGetValue(name, out var entry))
        {
            entry = new Entry { Kind = kind };
            _entries[name] = entry;
        }

        return entry;
    }

    private sealed class Entry
    {
        public string Kind { get; set; } = "";
        public TimeSpan? StaleAfter { get; set; }
        public DateTimeOffset? LastGoodAt { get; set; }
        public DateTimeOffset? LastAttemptAt { get; set; }
        public int ConsecutiveFailures { get; set; }
        public string? LastError { get; set; }
        public DateTimeOffset? LastErrorAt { get; set; }
        public int LastAccepted { get; set; }
        public int LastRejected { get; set; }
        public long TotalAccepted { get; set; }
        public long TotalRejected { get; set; }
        public long TotalFailures { get; set; }

        public FeedHealth ToHealth(string name, DateTimeOffset now)
        {
            var (status, detail) = FeedHealthRules.Evaluate(LastGoodAt, ConsecutiveFailures, LastRejected, StaleAfter, now);
            return new FeedHealth(name, Kind, status, detail, LastGoodAt, LastAttemptAt, ConsecutiveFailures, LastError, LastErrorAt,
                LastAccepted, LastRejected, TotalAccepted, TotalRejected, TotalFailures, StaleAfter);
        }
    }
}
