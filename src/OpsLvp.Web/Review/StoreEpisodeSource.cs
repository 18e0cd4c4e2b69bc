using OpsLvp.Core.Audit;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Review;

/// <summary>
/// Reads the record from the database: every audit entry (engine events are the entries whose payload is an
/// EventJson object, as <see cref="AuditEvents"/> writes them), the readings around the episodes, and the live
/// engine's profile (or an <see cref="AerodromeProfile"/> registered in the container). Readings are the raw readings
/// as received (rejected ones too, as a replay would see them); RVR the host derived and stored (source
/// "…:derived") is left out, since a replay derives it again. Kept in receipt order, as the engine saw them.
/// <para>The readings table grows with every feed poll (a year of a full aerodrome is tens of millions of rows), so
/// only the readings received within an episode's window are read: from its start less the export lead-in
/// (<see cref="EpisodeExport.LeadIn"/>) to its end (an open episode: to now), each widened by
/// <see cref="ReceiptMargin"/> because windows are on receipt time (indexed) while the review cuts on reading time.
/// The audit is read whole: it holds events, not readings, so it stays small.</para>
/// Stores that are not registered (no database configured) give an empty record with a clear detail.
/// </summary>
public sealed class StoreEpisodeSource(IServiceProvider services) : IEpisodeSource
{
    /// <summary>How far receipt may be from a reading's own time and still count for its window.</summary>
    public static readonly TimeSpan ReceiptMargin = TimeSpan.FromHours(1);

    public async Task<ReviewRecord> LoadAsync(CancellationToken cancellationToken = default)
    {
        var profile = services.GetService<AerodromeProfile>() ?? services.GetService<LiveEngineHost>()?.Profile;
        var audit = services.GetService<AuditStore>();
        var readingStore = services.GetService<ReadingStore>();
        if (audit is null || readingStore is null)
        {
            return new ReviewRecord(profile, [], [], [], new AuditVerification(0, true, null, null, "no database configured", null));
        }
        var entries = await audit.GetRangeAsync(1, long.MaxValue, cancellationToken);
        var chain = await audit.VerifyAsync(cancellationToken);
        var events = entries.Select(RecordedEvent.FromAudit).OfType<RecordedEvent>().ToList();
        var received = new List<ReceivedReading>();
        if (profile is not null)
        {
            foreach (var (from, to) in ReadingWindows(events, EpisodeExport.LeadIn(profile)))
            {
                received.AddRange(await readingStore.GetReceivedAsync(from, to, cancellationToken));
            }
        }
        var readings = received.Where(r => !r.IsDerived).Select(r => r.AsReading()).OfType<Reading>().ToList();
        var profiles = entries
            .Where(e => e.Kind == ProfileRecord.Kind)
            .Select(e => (e.Time, Profile: ProfileRecord.ProfileOf(e)))
            .Where(p => p.Profile is not null)
            .Select(p => (p.Time, p.Profile!))
            .ToList();
        return new ReviewRecord(profile, readings, events, entries, chain, profiles);
    }

    /// <summary>
    /// The receipt-time ranges [from, to) to read: one per episode (start − lead-in − margin to end + margin, an open
    /// episode to the end of time), overlapping ones merged, in order, so no reading is read twice.
    /// </summary>
    public static IReadOnlyList<(DateTimeOffset From, DateTimeOffset To)> ReadingWindows(IReadOnlyList<RecordedEvent> events, TimeSpan leadIn)
    {
        var windows = EpisodeModel.Bounds(events)
            .Select(b => (From: b.Start - leadIn - ReceiptMargin, To: b.End is { } end ? end + ReceiptMargin : DateTimeOffset.MaxValue))
            .OrderBy(w => w.From)
            .ToList();
        var merged = new List<(DateTimeOffset From, DateTimeOffset To)>();
        foreach (var w in windows)
        {
            if (merged.Count > 0 && w.From <= merged[^1].To)
            {
                merged[^1] = (merged[^1].From, w.To > merged[^1].To ? w.To : merged[^1].To);
            }
            else
            {
                merged.Add(w);
            }
        }
        return merged;
    }
}
