using BenchmarkDotNet.Attributes;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit;
using OpsLvp.Data;
using OpsLvp.Data.Stores;

namespace OpsLvp.Benchmarks.Audit;

/// <summary>
/// <see cref="AuditStore.AppendAsync"/> (checks and canonicalises each entry, reads the chain head, hashes, inserts, one
/// transaction on the store's writer connection) against a plain
/// Microsoft.Data.Sqlite INSERT of rows of the same size into the same table of a file made by the same migrations,
/// with the same WAL and synchronous pragmas; one transaction per operation holding <see cref="Batch"/> entries.
/// Baseline (ratio 1.00) in each (Sync, Batch) pair: the raw INSERT.
/// </summary>
[MemoryDiagnoser]
public class AuditAppendBenchmarks
{
    /// <summary>An invented, typical audit payload (a confirmed transition), about 300 bytes.</summary>
    public const string Payload =
        """{"kind":"transition_confirmed","from":"preparation","to":"active","by":"system","rule":"active.enter","governing":{"sensor":"rvr-07l-tdz","rvrM":450,"ceilingFt":180},"note":"invented benchmark payload","at":"2026-01-15T21:41:36Z"}""";

    /// <summary>Folder for the database files; a temporary folder on the root disk unless set (--data-dir).</summary>
    public static string DataDir { get; set; } = Path.Combine(Path.GetTempPath(), "opslvp-bench");

    private string _folder = "";
    private AuditStore _store = null!;
    private SqliteConnection _raw = null!;
    private SqliteCommand _insert = null!;
    private long _rawSequence;
    private long _time;
    private NewAuditEntry[] _entries = [];

    [Params(SyncMode.Full, SyncMode.Normal)]
    public SyncMode Sync { get; set; }

    [Params(1, 10, 100)]
    public int Batch { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _folder = Path.Combine(DataDir, Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(_folder);
        var ours = Path.Combine(_folder, "ours.db");
        var raw = Path.Combine(_folder, "raw.db");
        foreach (var file in new[] { ours, raw })
        {
            var factory = new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions($"Data Source={file}"));
            DatabaseStartup.MigrateAndCheckAsync(factory).GetAwaiter().GetResult();
        }
        SqliteConnection.ClearAllPools();

        DbContextOptions<OpsLvpDbContext> options;
        if (Sync == SyncMode.Full)
        {
            options = OpsLvpDatabase.SqliteOptions($"Data Source={ours}");
        }
        else
        {
            options = new DbContextOptionsBuilder<OpsLvpDbContext>()
                .UseSqlite($"Data Source={ours}")
                .AddInterceptors(new BenchPragmaInterceptor(Sync))
                .Options;
        }
        _store = new AuditStore(new OpsLvpDbContextFactory(options));

        _raw = new SqliteConnection($"Data Source={raw}");
        _raw.Open();
        using (var pragma = _raw.CreateCommand())
        {
            pragma.CommandText = BenchPragmaInterceptor.PragmaSql(Sync);
            pragma.ExecuteNonQuery();
        }
        _insert = _raw.CreateCommand();
        _insert.CommandText =
            "INSERT INTO audit_entries (sequence, time, actor, kind, payload_json, previous_hash, hash) VALUES ($s, $t, $a, $k, $p, $ph, $h);";
        foreach (var name in new[] { "$s", "$t", "$a", "$k", "$p", "$ph", "$h" })
        {
            _insert.Parameters.Add(new SqliteParameter { ParameterName = name });
        }
        _insert.Prepare();
        _entries = new NewAuditEntry[Batch];
    }

    [Benchmark(Baseline = true, Description = "Raw SQLite INSERT")]
    public void RawInsert()
    {
        using var transaction = _raw.BeginTransaction(deferred: false);
        _insert.Transaction = transaction;
        for (var i = 0; i < Batch; i++)
        {
            var sequence = ++_rawSequence;
            _insert.Parameters[0].Value = sequence;
            _insert.Parameters[1].Value = AuditCanonical.FormatTime(NextTime());
            _insert.Parameters[2].Value = "system";
            _insert.Parameters[3].Value = "transition_confirmed";
            _insert.Parameters[4].Value = Payload;
            // Same width as a SHA-256 hex hash (64 characters); the raw row does no hashing.
            _insert.Parameters[5].Value = FakeHash(sequence - 1);
            _insert.Parameters[6].Value = FakeHash(sequence);
            _insert.ExecuteNonQuery();
        }
        transaction.Commit();
    }

    [Benchmark(Description = "AuditStore.AppendAsync")]
    public async Task<int> Ours()
    {
        for (var i = 0; i < Batch; i++)
        {
            _entries[i] = new NewAuditEntry("system", "transition_confirmed", Payload, NextTime());
        }
        var appended = await _store.AppendAsync(_entries);
        return appended.Count;
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        _insert.Dispose();
        _raw.Dispose();
        _store.Dispose();
        SqliteConnection.ClearAllPools();
        BenchFiles.TryDeleteFolder(_folder);
    }

    private DateTimeOffset NextTime() => new DateTimeOffset(2026, 1, 15, 0, 0, 0, TimeSpan.Zero).AddMilliseconds(++_time);

    private static string FakeHash(long n) => n.ToString("x64", System.Globalization.CultureInfo.InvariantCulture);
}
