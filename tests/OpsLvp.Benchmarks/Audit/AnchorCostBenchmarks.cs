using System.Security.Cryptography;
using BenchmarkDotNet.Attributes;
using Microsoft.Data.Sqlite;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Anchors;

namespace OpsLvp.Benchmarks.Audit;

/// <summary>
/// Issue 12: what tamper evidence to the last entry costs. On the embedded default (SQLite file, WAL, FULL): an append
/// of one entry with the engine state row, plain (baseline), and with the state row sealed by ECDSA P-256 inside the
/// transaction (<see cref="IStateSealer"/>, as <c>AnchorKey</c> does); and a signed chain head: the ECDSA P-256
/// signature alone (<see cref="AuditAnchor.Sign"/>) and with the anchor log append flushed to disk
/// (<see cref="AnchorLog.Append"/>, what the server does every ≤ 5 minutes and at shutdown). Data invented.
/// </summary>
[MemoryDiagnoser]
public class AnchorCostBenchmarks
{
    private const string StateJson = """{"phase":"Active","note":"invented benchmark state","episode":{"id":"XDMO-20260115T0300Z"}}""";

    private string _folder = "";
    private AuditStore _plain = null!;
    private AuditStore _sealed = null!;
    private ECDsa _key = null!;
    private AnchorLog _log = null!;
    private long _tick;
    private readonly DateTimeOffset _t0 = new(2026, 1, 15, 0, 0, 0, TimeSpan.Zero);

    [GlobalSetup]
    public void Setup()
    {
        _folder = Path.Combine(AuditAppendBenchmarks.DataDir, Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(_folder);
        _key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        _plain = new AuditStore(Migrated(Path.Combine(_folder, "plain.db")));
        _sealed = new AuditStore(Migrated(Path.Combine(_folder, "sealed.db")), new Sealer(_key));
        _log = new AnchorLog(new AnchorFiles(Path.Combine(_folder, "anchor-key.pem"), Path.Combine(_folder, "anchors.jsonl")));
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        _plain.Dispose();
        _sealed.Dispose();
        _key.Dispose();
        SqliteConnection.ClearAllPools();
    }

    [Benchmark(Baseline = true, Description = "Append 1 entry + state row, plain")]
    public Task<IReadOnlyList<OpsLvp.Core.Audit.AuditEntry>> PlainAppend() => Append(_plain);

    [Benchmark(Description = "Append 1 entry + state row, sealed (ECDSA P-256 in the transaction)")]
    public Task<IReadOnlyList<OpsLvp.Core.Audit.AuditEntry>> SealedAppend() => Append(_sealed);

    [Benchmark(Description = "Sign a chain head (ECDSA P-256)")]
    public AuditAnchor SignHead() => AuditAnchor.Sign(_key, ++_tick, AuditAppendBenchmarksHash, _t0.AddSeconds(_tick), false);

    [Benchmark(Description = "Sign a chain head + anchor log append with fsync")]
    public AuditAnchor SignHeadAndLog()
    {
        var anchor = AuditAnchor.Sign(_key, ++_tick, AuditAppendBenchmarksHash, _t0.AddSeconds(_tick), false);
        _log.Append(anchor);
        return anchor;
    }

    private const string AuditAppendBenchmarksHash = "742bb6bc0ca9723b7081ae32c155f0d8668aa64ad06f89e085dce78bb6fb78ce";

    private Task<IReadOnlyList<OpsLvp.Core.Audit.AuditEntry>> Append(AuditStore store)
    {
        var at = _t0.AddSeconds(15 * ++_tick);
        return store.AppendAsync([new NewAuditEntry("engine", "transition", AuditAppendBenchmarks.Payload, at)], new EngineStateWrite(StateJson, "xdmo-invented-1", at));
    }

    private static OpsLvpDbContextFactory Migrated(string file)
    {
        var factory = new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions($"Data Source={file}"));
        DatabaseStartup.MigrateAndCheckAsync(factory).GetAwaiter().GetResult();
        return factory;
    }

    private sealed class Sealer(ECDsa key) : IStateSealer
    {
        public string? Seal(long sequence, string? hash, string stateJson, string profileVersion) => StateSeal.Sign(key, sequence, hash, stateJson, profileVersion);
    }
}
