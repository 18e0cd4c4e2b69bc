using BenchmarkDotNet.Attributes;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.Benchmarks.Audit;

/// <summary>
/// What an append does besides the INSERTs (explains the ours/raw ratio): the head query the store runs in each
/// transaction on its writer connection (baseline), the chain work per entry with no database (check and
/// canonicalise, SHA-256), the canonical payload alone, and what the append path cost per call before it kept a
/// writer connection (a fresh EF context and its head query). A file of 1 000 entries, product pragmas (WAL, FULL).
/// </summary>
[MemoryDiagnoser]
public class AuditOverheadBenchmarks
{
    private string _folder = "";
    private IDbContextFactory<OpsLvpDbContext> _factory = null!;
    private SqliteConnection _raw = null!;
    private SqliteCommand _head = null!;
    private readonly DateTimeOffset _at = new(2026, 1, 15, 3, 0, 0, TimeSpan.Zero);

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
        _head.CommandText = "SELECT sequence, hash FROM audit_entries ORDER BY sequence DESC LIMIT 1;";
        _head.Prepare();
    }

    [Benchmark(Baseline = true, Description = "Head query: sequence and hash (open connection)")]
    public long RawHead()
    {
        using var reader = _head.ExecuteReader();
        reader.Read();
        return reader.GetInt64(0);
    }

    [Benchmark(Description = "Chain work per entry, no database (AuditChain.Prepare + Append)")]
    public string ChainWork()
    {
        var pending = AuditChain.Prepare(_at, "system", "transition_confirmed", AuditAppendBenchmarks.Payload);
        return AuditChain.Append(new AuditChainHead(1000, AuditChain.GenesisHash), pending).Hash;
    }

    [Benchmark(Description = "of which the canonical payload (AuditCanonical.CanonicalPayload)")]
    public string CanonicalPayload() => AuditCanonical.CanonicalPayload(AuditAppendBenchmarks.Payload);

    [Benchmark(Description = "Before the writer connection: EF fresh context, open, empty transaction")]
    public async Task EmptyTransaction()
    {
        await using var db = await _factory.CreateDbContextAsync();
        await using var transaction = await db.Database.BeginTransactionAsync();
        await transaction.CommitAsync();
    }

    [Benchmark(Description = "Before the writer connection: EF fresh context, head query")]
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
        BenchFiles.TryDeleteFolder(_folder);
    }
}
