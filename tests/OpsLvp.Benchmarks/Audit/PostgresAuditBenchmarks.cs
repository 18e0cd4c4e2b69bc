using BenchmarkDotNet.Attributes;
using Npgsql;
using NpgsqlTypes;
using OpsLvp.Core.Audit;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Benchmarks.Services;

namespace OpsLvp.Benchmarks.Audit;

/// <summary>
/// Issue 16: the audit append on PostgreSQL as the engine host does it for one evaluation that covers a tick of
/// readings — <see cref="ReadingStore.InsertAsync(IReadOnlyList{ReceivedReading}, CancellationToken)"/> of <see cref="Readings"/> readings, then
/// <see cref="AuditStore.AppendAsync"/> of one entry (both through <c>PostgresWriter</c>, two transactions) — against
/// raw Npgsql INSERTs of the same rows on a kept connection with prepared statements, also two transactions, into a
/// second database made by the same migrations. A throwaway cluster on loopback (<see cref="BenchPostgres"/>),
/// durable defaults (fsync, synchronous_commit on). Baseline (ratio 1.00): the raw INSERTs. Readings invented.
/// </summary>
[MemoryDiagnoser]
public class PostgresAuditBenchmarks
{
    private AuditStore _audit = null!;
    private ReadingStore _readings = null!;
    private NpgsqlConnection _raw = null!;
    private NpgsqlCommand _rawReading = null!;
    private NpgsqlCommand _rawAudit = null!;
    private long _rawSequence;
    private long _tick;
    private readonly DateTimeOffset _t0 = new(2026, 1, 15, 0, 0, 0, TimeSpan.Zero);

    /// <summary>Readings per evaluation: one tick of the demo aerodrome (9 RVR sensors, 2 ceilometers).</summary>
    [Params(11)]
    public int Readings { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var ours = BenchPostgres.Shared.CreateDatabase();
        var raw = BenchPostgres.Shared.CreateDatabase();
        foreach (var cs in new[] { ours, raw })
        {
            DatabaseStartup.MigrateAndCheckAsync(new OpsLvpDbContextFactory(OpsLvpDatabase.PostgresOptions(cs))).GetAwaiter().GetResult();
        }
        var factory = new OpsLvpDbContextFactory(OpsLvpDatabase.PostgresOptions(ours));
        _audit = new AuditStore(factory);
        _readings = new ReadingStore(factory);
        _raw = new NpgsqlConnection(raw);
        _raw.Open();
        _rawReading = new NpgsqlCommand(
            "INSERT INTO readings (time, received_at, source, sensor, kind, value, status, accepted, reject_reason, reject_detail) VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10)", _raw);
        foreach (var type in new[] { NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Double, NpgsqlDbType.Text, NpgsqlDbType.Boolean, NpgsqlDbType.Text, NpgsqlDbType.Text })
        {
            _rawReading.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = type });
        }
        _rawReading.Prepare();
        _rawAudit = new NpgsqlCommand("INSERT INTO audit_entries (sequence, time, actor, kind, payload_json, previous_hash, hash) VALUES ($1, $2, $3, $4, $5, $6, $7)", _raw);
        _rawAudit.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Bigint });
        for (var i = 0; i < 6; i++)
        {
            _rawAudit.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Text });
        }
        _rawAudit.Prepare();
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        _audit.Dispose();
        _readings.Dispose();
        _raw.Dispose();
    }

    [Benchmark(Baseline = true, Description = "Raw Npgsql INSERTs (readings, then the entry)")]
    public void RawInsert()
    {
        var at = _t0.AddSeconds(15 * ++_tick);
        using (var transaction = _raw.BeginTransaction())
        {
            _rawReading.Transaction = transaction;
            for (var i = 0; i < Readings; i++)
            {
                var p = _rawReading.Parameters;
                p[0].Value = AuditCanonical.FormatTime(at);
                p[1].Value = AuditCanonical.FormatTime(at);
                p[2].Value = "sim";
                p[3].Value = Sensor(i);
                p[4].Value = i < 9 ? "rvr" : "ceiling";
                p[5].Value = 550.0 + i;
                p[6].Value = "ok";
                p[7].Value = true;
                p[8].Value = DBNull.Value;
                p[9].Value = DBNull.Value;
                _rawReading.ExecuteNonQuery();
            }
            transaction.Commit();
        }
        using (var transaction = _raw.BeginTransaction())
        {
            var sequence = ++_rawSequence;
            _rawAudit.Transaction = transaction;
            var p = _rawAudit.Parameters;
            p[0].Value = sequence;
            p[1].Value = AuditCanonical.FormatTime(at);
            p[2].Value = "engine";
            p[3].Value = "transition";
            p[4].Value = AuditAppendBenchmarks.Payload;
            p[5].Value = FakeHash(sequence - 1);
            p[6].Value = FakeHash(sequence);
            _rawAudit.ExecuteNonQuery();
            transaction.Commit();
        }
    }

    [Benchmark(Description = "ReadingStore.InsertAsync + AuditStore.AppendAsync (PostgresWriter)")]
    public async Task<long> Ours()
    {
        var at = _t0.AddSeconds(15 * ++_tick);
        var batch = new ReceivedReading[Readings];
        for (var i = 0; i < Readings; i++)
        {
            batch[i] = new ReceivedReading(at, "sim", Sensor(i), i < 9 ? "rvr" : "ceiling", at, 550.0 + i, "ok", true);
        }
        await _readings.InsertAsync(batch);
        var committed = await _audit.AppendAsync([new NewAuditEntry("engine", "transition", AuditAppendBenchmarks.Payload, at)]);
        return committed[0].Sequence;
    }

    // same width as a SHA-256 hex hash; the raw row does no hashing
    private static string FakeHash(long n) => n.ToString("x64", System.Globalization.CultureInfo.InvariantCulture);

    private static string Sensor(int i) => i < 9 ? $"rvr-{i / 3}-{(i % 3) switch { 0 => "tdz", 1 => "mid", _ => "end" }}" : $"ceilometer-{i - 9}";
}
