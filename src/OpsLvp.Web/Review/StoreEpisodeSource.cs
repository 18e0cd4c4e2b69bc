using OpsLvp.Core.Audit;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Review;

/// <summary>
/// Reads the record from the database: every audit entry (engine events are the entries whose payload is an
/// EventJson object, as <see cref="AuditEvents"/> writes them), the accepted readings, and the live engine's profile
/// (or an <see cref="AerodromeProfile"/> registered in the container). Readings are the raw readings as received
/// (rejected ones too, as a replay would see them); RVR the host derived and stored (source "…:derived") is left
/// out, since a replay derives it again. Kept in receipt order, as the engine saw them.
/// Stores that are not registered (no database configured) give an empty record with a clear detail.
/// </summary>
public sealed class StoreEpisodeSource(IServiceProvider services) : IEpisodeSource
{
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
        var received = await readingStore.GetReceivedAsync(DateTimeOffset.UnixEpoch, DateTimeOffset.UnixEpoch.AddYears(1000), cancellationToken);
        var readings = received
            .Where(r => !r.Source.EndsWith(":derived", StringComparison.Ordinal) && r.Time is not null && r.Value is not null && Enum.TryParse<ReadingKind>(r.Kind, out _) && Enum.TryParse<ReadingStatus>(r.Status, out _))
            .Select(r => new Reading(r.Time!.Value, r.Sensor, Enum.Parse<ReadingKind>(r.Kind), r.Value!.Value,
                Enum.Parse<ReadingStatus>(r.Status!)))
            .ToList();
        var events = entries.Select(RecordedEvent.FromAudit).OfType<RecordedEvent>().ToList();
        return new ReviewRecord(profile, readings, events, entries, chain);
    }
}
