using Microsoft.Data.Sqlite;
using OpsLvp.Core.Audit;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.FaultCases;

/// <summary>
/// What the database file says after a fault, read with the product's own stores on connections that are not pooled
/// (so no descriptor stays open on a filesystem that is unmounted next).
/// </summary>
public sealed class StoredFacts : IDisposable
{
    private readonly string _connectionString;

    private readonly AuditStore _audit;

    private readonly ReadingStore _readings;

    public StoredFacts(string databasePath)
    {
        _connectionString = $"Data Source={databasePath};Pooling=False";
        var factory = new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions(_connectionString));
        _audit = new AuditStore(factory);
        _readings = new ReadingStore(factory);
    }

    /// <summary>
    /// Null when the file passes <c>integrity_check</c>, its audit chain verifies, its sequences run 1..n without a gap,
    /// and every head seen before (sequence and hash) is still there unchanged (no sequence reused); else what is wrong.
    /// </summary>
    public async Task<string?> CheckChainAsync(IReadOnlyCollection<(long Sequence, string Hash)> headsSeenBefore)
    {
        ArgumentNullException.ThrowIfNull(headsSeenBefore);
        await using (var connection = new SqliteConnection(_connectionString))
        {
            await connection.OpenAsync();
            await using var integrity = connection.CreateCommand();
            integrity.CommandText = "PRAGMA integrity_check;";
            var result = (string?)await integrity.ExecuteScalarAsync();
            if (result != "ok")
            {
                return $"integrity_check: {result}";
            }
            await using var gaps = connection.CreateCommand();
            gaps.CommandText = "SELECT COUNT(*) = MAX(sequence) AND MIN(sequence) = 1 FROM audit_entries;";
            if ((long)(await gaps.ExecuteScalarAsync())! != 1L)
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
                return $"entry {sequence} seen before as {hash[..12]}… is now {(entry is null ? "gone" : entry.Hash[..12] + "… (sequence reused)")}";
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

    public void Dispose()
    {
        _audit.Dispose();
        _readings.Dispose();
    }
}
