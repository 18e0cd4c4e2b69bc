using Npgsql;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.FaultCases;

/// <summary>What a PostgreSQL database says after a fault, read with the product's own stores on unpooled connections.</summary>
public sealed class PostgresStoredFacts : IDisposable
{
    private readonly string _connectionString;

    private readonly AuditStore _audit;

    private readonly ReadingStore _readings;

    public PostgresStoredFacts(string connectionString)
    {
        _connectionString = new NpgsqlConnectionStringBuilder(connectionString) { Pooling = false }.ConnectionString;
        var factory = new OpsLvpDbContextFactory(OpsLvpDatabase.PostgresOptions(_connectionString));
        _audit = new AuditStore(factory);
        _readings = new ReadingStore(factory);
    }

    /// <summary>
    /// Null when the audit chain verifies, its sequences run 1..n without a gap, and every head seen before (sequence
    /// and hash) is still there unchanged (no sequence written twice); else what is wrong.
    /// </summary>
    public async Task<string?> CheckChainAsync(IReadOnlyCollection<(long Sequence, string Hash)> headsSeenBefore)
    {
        ArgumentNullException.ThrowIfNull(headsSeenBefore);
        await using (var connection = new NpgsqlConnection(_connectionString))
        {
            await connection.OpenAsync();
            await using var gaps = new NpgsqlCommand("SELECT COUNT(*) = MAX(sequence) AND MIN(sequence) = 1 FROM audit_entries", connection);
            if (await gaps.ExecuteScalarAsync() is not true)
            {
                return "audit sequences are not 1..n without a gap";
            }
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

    public Task<OpsLvp.Core.Audit.AuditEntry?> HeadAsync() => _audit.GetHeadAsync();

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
        _audit.Dispose();
        _readings.Dispose();
    }
}
