using BenchmarkDotNet.Attributes;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.Benchmarks.Audit;

/// <summary>
/// What an append costs before it writes anything (explains the ours/raw ratio): the steps
/// <see cref="AuditStore.AppendAsync"/> takes on a fresh context against the same head query on an open raw
/// connection (baseline). A file of 1 000 entries, product pragmas (WAL, FULL).
/// </summary>
[MemoryDiagnoser]
public class AuditOverheadBenchmarks
{
    private string _folder = "";
    private IDbContextFactory<OpsLvpDbContext> _factory = null!;
    private SqliteConnection _raw = null!;
    private SqliteCommand _head = null!;

    [GlobalSetup]
    public void Setup()
    {
        _folder = Path.Combine(AuditAppendBenchmarks.DataDir, Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(_folder);
        var file = Path.Combine(_folder, "overhead.db");
        _factory = new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions($"Data Source={file}"));
        DatabaseStartup.MigrateAndCheckAsync(_factory).GetAwaiter().GetResult();
        using (var store = new AuditStore(_factory))
        {
            var entries = Enumerable.Range(0, 1000)
                .Select(i => new NewAuditEntry("system", "transition_confirmed", AuditAppendBenchmarks.Payload, new DateTimeOffset(2026, 1, 15, 0, 0, 0, TimeSpan.Zero).AddSeconds(i)))
                .ToList();
            store.AppendAsync(entries).GetAwaiter().GetResult();
        }
        _raw = new SqliteConnection($"Data Source={file}");
        _raw.Open();
        _head = _raw.CreateCommand();
        _head.CommandText = "SELECT sequence, time, actor, kind, payload_json, previous_hash, hash FROM audit_entries ORDER BY sequence DESC LIMIT 1;";
        _head.Prepare();
    }

    [Benchmark(Baseline = true, Description = "Raw head query (open connection)")]
    public long RawHead()
    {
        using var reader = _head.ExecuteReader();
        reader.Read();
        return reader.GetInt64(0);
    }

    [Benchmark(Description = "EF: fresh context, open, empty transaction")]
    public async Task EmptyTransaction()
    {
        await using var db = await _factory.CreateDbContextAsync();
        await using var transaction = await db.Database.BeginTransactionAsync();
        await transaction.CommitAsync();
    }

    [Benchmark(Description = "EF: fresh context, head query")]
    public async Task<long> EfHead()
    {
        await using var db = await _factory.CreateDbContextAsync();
        var head = await db.AuditEntries.AsNoTracking().OrderByDescending(e => e.Sequence).FirstOrDefaultAsync();
        return head?.Sequence ?? 0;
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        _head.Dispose();
        _raw.Dispose();
        SqliteConnection.ClearAllPools();
        try
        {
            Directory.Delete(_folder, recursive: true);
        }
        catch (IOException)
        {
            // A leftover temporary folder is harmless.
        }
    }
}
