using OpsLvp.Core.Audit;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.FaultCases;

/// <summary>
/// What a database says after a fault, read with the product's own stores; the provider's own checks (integrity,
/// sequence gaps) come from <see cref="StoredFacts"/> (SQLite file) and <see cref="PostgresStoredFacts"/>.
/// </summary>
public abstract class DatabaseFacts : IDisposable
{
    private readonly AuditStore _audit;

    private readonly ReadingStore _readings;

    protected DatabaseFacts(OpsLvpDbContextFactory factory)
    {
        _audit = new AuditStore(factory);
        _readings = new ReadingStore(factory);
    }

    /// <summary>Null when the database passes the provider's own checks (e.g. sequences 1..n without a gap); else what is wrong.</summary>
    protected abstract Task<string?> CheckDatabaseAsync();

    /// <summary>
    /// Null when the provider's checks pass, the audit chain verifies and every head seen before (sequence and hash) is
    /// still there unchanged (no sequence written twice); else what is wrong.
    /// </summary>
    public async Task<string?> CheckChainAsync(IReadOnlyCollection<(long Sequence, string Hash)> headsSeenBefore)
    {
        ArgumentNullException.ThrowIfNull(headsSeenBefore);
        if (await CheckDatabaseAsync() is { } wrong)
        {
            return wrong;
        }
        var verification = await _audit.VerifyAsync();
        if (!verification.Ok)
        {
            return $"audit verify: {verification.Failure} at {verification.FirstBadSequence}: {verification.Detail}";
        }
        foreach (var (sequence, hash) in headsSeenBefore)
        {
            var entry = (await _audit.GetRangeAsync(sequence, sequence)).SingleOrDefault();
            if (entry is null || entry.Hash != hash)
            {
                return $"entry {sequence} seen before as {hash[..12]}… is now {(entry is null ? "gone" : entry.Hash[..12] + "… (sequence written twice)")}";
            }
        }
        return null;
    }

    public Task<AuditEntry?> HeadAsync() => _audit.GetHeadAsync();

    public async Task<IReadOnlyList<AuditEntry>> EntriesOfKindAsync(string kind)
    {
        var head = await _audit.GetHeadAsync();
        return head is null ? [] : (await _audit.GetRangeAsync(1, head.Sequence)).Where(e => e.Kind == kind).ToList();
    }

    /// <summary>The acknowledged reading times (of <see cref="FaultProfile.Tdz"/>) that are not in the readings table.</summary>
    public async Task<IReadOnlyList<DateTimeOffset>> MissingAsync(IReadOnlyCollection<DateTimeOffset> acknowledged, DateTimeOffset receivedFrom)
    {
        ArgumentNullException.ThrowIfNull(acknowledged);
        if (acknowledged.Count == 0)
        {
            return [];
        }
        var stored = (await _readings.GetReceivedAsync(receivedFrom, DateTimeOffset.UtcNow.AddDays(1)))
            .Where(r => r.Sensor == FaultProfile.Tdz && r.Time is not null)
            .Select(r => r.Time!.Value)
            .ToHashSet();
        return acknowledged.Where(a => !stored.Contains(a)).ToList();
    }

    /// <summary>Readings of <see cref="FaultProfile.Tdz"/> stored more than once (an acknowledged reading applied twice), by time.</summary>
    public async Task<int> DuplicatesAsync(DateTimeOffset receivedFrom)
    {
        var rows = (await _readings.GetReceivedAsync(receivedFrom, DateTimeOffset.UtcNow.AddDays(1)))
            .Where(r => r.Sensor == FaultProfile.Tdz && r.Time is not null && !r.IsDerived);
        return rows.GroupBy(r => r.Time!.Value).Count(g => g.Count() > 1);
    }

    public void Dispose()
    {
        Dispose(disposing: true);
        GC.SuppressFinalize(this);
    }

    protected virtual void Dispose(bool disposing)
    {
        if (disposing)
        {
            _audit.Dispose();
            _readings.Dispose();
        }
    }
}
