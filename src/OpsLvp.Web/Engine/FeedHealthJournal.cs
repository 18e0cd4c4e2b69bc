using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Engine;

/// <summary>
/// Which feed-health changes become audit entries (docs/feeds.md, "Health in the audit"): a change is recorded at once
/// when the feed had no entry within <c>Feeds:HealthAuditInterval</c> (real time); otherwise it is counted and carried
/// into the feed's next entry, written as soon as the interval is up. So a flapping feed writes at most one entry per
/// interval, each naming the status before and after and how many changes it covers, and no change goes uncounted,
/// even one that ends where it began (<c>feed_flapped</c>). Used by the engine host, one evaluation at a time.
/// </summary>
public sealed class FeedHealthJournal(TimeSpan interval)
{
    private readonly Dictionary<string, Entry> _feeds = new(StringComparer.Ordinal);

    /// <summary>
    /// Takes the current health of every feed and returns the entries due now. Nothing is marked recorded until
    /// <see cref="Recorded"/> is called with them after the audit commit, so a failed commit proposes them again.
    /// </summary>
    public List<Proposal> Observe(IReadOnlyList<FeedHealth> snapshot, DateTimeOffset now, DateTimeOffset realNow)
    {
        ArgumentNullException.ThrowIfNull(snapshot);
        var due = new List<Proposal>();
        foreach (var f in snapshot)
        {
            if (!_feeds.TryGetValue(f.Name, out var e))
            {
                _feeds[f.Name] = new Entry { Observed = f.Status, Recorded = f.Status };
                continue;
            }
            if (f.Status != e.Observed)
            {
                e.Observed = f.Status;
                e.Changes++;
                e.ChangesTo[(int)f.Status]++;
                e.FirstChangeAt ??= now;
            }
            if (e.Changes == 0 || (e.LastEntryAt is { } last && realNow - last < interval))
            {
                continue;
            }
            var kind = e.Observed == e.Recorded
                ? "feed_flapped"
                : e.Observed switch
                {
                    FeedStatus.Ok => "feed_restored",
                    FeedStatus.Down => "feed_lost",
                    _ => "feed_degraded",
                };
            due.Add(new Proposal(f.Name, e.Observed, e.Changes, AuditEvents.HostEntry(kind, now, new
            {
                feed = f.Name,
                from = FeedHealthDto.StatusText(e.Recorded),
                to = FeedHealthDto.StatusText(e.Observed),
                changes = e.Changes,
                toOk = e.ChangesTo[(int)FeedStatus.Ok],
                toDegraded = e.ChangesTo[(int)FeedStatus.Degraded],
                toDown = e.ChangesTo[(int)FeedStatus.Down],
                firstChangeAt = e.FirstChangeAt,
                detail = f.StatusDetail,
                lastError = f.LastError,
            })));
        }
        return due;
    }

    /// <summary>Marks proposals as committed: their changes are now on record and the interval starts again.</summary>
    public void Recorded(IEnumerable<Proposal> proposals, DateTimeOffset realNow)
    {
        ArgumentNullException.ThrowIfNull(proposals);
        foreach (var p in proposals)
        {
            var e = _feeds[p.Feed];
            e.Recorded = p.Status;
            e.Changes -= p.Changes;
            if (e.Changes == 0)
            {
                Array.Clear(e.ChangesTo);
                e.FirstChangeAt = null;
            }
            e.LastEntryAt = realNow;
        }
    }

    /// <summary>An audit entry due for <paramref name="Feed"/>, covering <paramref name="Changes"/> observed changes.</summary>
    public sealed record Proposal(string Feed, FeedStatus Status, int Changes, OpsLvp.Data.Stores.NewAuditEntry Entry);

    private sealed class Entry
    {
        public FeedStatus Observed { get; set; }

        public FeedStatus Recorded { get; set; }

        public int Changes { get; set; }

        public int[] ChangesTo { get; } = new int[Enum.GetValues<FeedStatus>().Length];

        public DateTimeOffset? FirstChangeAt { get; set; }

        public DateTimeOffset? LastEntryAt { get; set; }
    }
}
