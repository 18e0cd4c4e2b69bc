using System.IO.Compression;
using System.Text.Json;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Cli;
using OpsLvp.Core.Readings;
using OpsLvp.Data;
using OpsLvp.Data.Retention;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Retention;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Persistence;

/// <summary>
/// Pruning of raw readings with an export (docs/retention.md) on a real SQLite file and a real throwaway PostgreSQL:
/// the pruned readings are exported and read back, one audit entry records the run, <c>opslvp audit verify</c> reports
/// the range as pruned (not as edited readings), checks the export files given the folder and catches an edited one;
/// an export folder that cannot be written deletes nothing. Readings are invented (sensor names of no real aerodrome).
/// </summary>
public sealed class ReadingsRetentionTests
{
    private const string Sqlite = OpsLvpDatabase.SqliteProvider;
    private const string Postgres = OpsLvpDatabase.PostgresProvider;

    // invented: three days of readings from 2026-01-02
    private static readonly DateTimeOffset s_day1 = new(2026, 1, 2, 0, 0, 0, TimeSpan.Zero);

    [Fact]
    public Task Prune_ExportsReadsBackRecordsAndVerifies_Sqlite() => Prune_ExportsReadsBackRecordsAndVerifies(Sqlite);

    [PostgresFact]
    public Task Prune_ExportsReadsBackRecordsAndVerifies_Postgres() => Prune_ExportsReadsBackRecordsAndVerifies(Postgres);

    [Fact]
    public Task EditedExportFile_IsDetectedByVerify_Sqlite() => EditedExportFile_IsDetectedByVerify(Sqlite);

    [PostgresFact]
    public Task EditedExportFile_IsDetectedByVerify_Postgres() => EditedExportFile_IsDetectedByVerify(Postgres);

    [Fact]
    public Task FailingExportFolder_DeletesNothing_Sqlite() => FailingExportFolder_DeletesNothing(Sqlite);

    [PostgresFact]
    public Task FailingExportFolder_DeletesNothing_Postgres() => FailingExportFolder_DeletesNothing(Postgres);

    [Fact]
    public void Cutoff_IsOffWithZeroDays_AndNeverReachesIntoAnOpenEpisode()
    {
        var now = s_day1.AddDays(40);
        Assert.Null(RetentionCutoff.Compute(now, 0, null));
        Assert.Equal(now.AddDays(-30), RetentionCutoff.Compute(now, 30, null));
        // an episode open for 35 days keeps its readings and the hour before it
        Assert.Equal(now.AddDays(-35) - RetentionCutoff.EpisodeMargin, RetentionCutoff.Compute(now, 30, now.AddDays(-35)));
        // a recent episode does not move the cutoff
        Assert.Equal(now.AddDays(-30), RetentionCutoff.Compute(now, 30, now.AddHours(-2)));
    }

    private static async Task Prune_ExportsReadsBackRecordsAndVerifies(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        var exports = Directory.CreateTempSubdirectory("opslvp-exports-").FullName;
        using var audit = new AuditStore(db.Factory);
        using var store = new ReadingStore(db.Factory);
        await Seed(audit, store);
        var before = await All(db);

        // cutoff one hour into day 3: days 1 and 2 and day 3's first readings are due; the 5 uncovered ones are kept though old
        var outcome = await new ReadingsPruner(db.Factory, audit, TimeProvider.System).RunAsync(new PruneRequest(s_day1.AddDays(2).AddHours(1), exports, BatchSize: 3));

        Assert.Null(outcome.Failure);
        var pruned = Assert.IsType<PrunedReadings>(outcome.Pruned);
        Assert.Equal(0, pruned.After);
        Assert.Equal(24, pruned.To); // 10 + 10 + 4 readings (day 3 at 00:00, 00:15, 00:30, 00:45)
        Assert.Equal(24, pruned.Count);
        Assert.Equal(3, pruned.Files.Count);
        var after = await All(db);
        Assert.Equal(before.Count - 24, after.Count);
        Assert.All(after, r => Assert.True(r.Id > 24));
        Assert.Contains(after, r => r.Id == 31); // uncovered, received on day 1: never pruned

        // one audit entry names the run; the export reads back as the rows were
        var entry = await audit.GetLastOfKindAsync(PrunedReadings.Kind);
        Assert.NotNull(entry);
        Assert.Equal(outcome.AuditSequence, entry.Sequence);
        Assert.Equal(pruned, PrunedReadings.From(entry.PayloadJson), new PrunedComparer());
        var exported = pruned.Files.SelectMany(f => ReadingsExportFormat.Read(Path.Combine(exports, f.Name))).ToList();
        Assert.Equal(before.Take(24).ToList(), exported);
        foreach (var f in pruned.Files)
        {
            var path = Path.Combine(exports, f.Name);
            Assert.Equal(f.Sha256, ReadingsExportFormat.FileSha256(path));
            Assert.Equal($"{f.Sha256}  {f.Name}\n", await File.ReadAllTextAsync(path + ".sha256"));
        }
        Assert.Equal(["readings-2026-01-02-000000000001-000000000010.ndjson.gz", "readings-2026-01-03-000000000011-000000000020.ndjson.gz", "readings-2026-01-04-000000000021-000000000024.ndjson.gz"],
            pruned.Files.Select(f => f.Name).ToArray());

        // verify: the pruned range is reported as pruned, not as tampering; with the folder, windows are recomputed from it
        var (code, stdout, stderr) = Run("audit", "verify", "--db", Target(db));
        Assert.True(code == 0, stdout + stderr);
        var result = JsonDocument.Parse(stdout).RootElement;
        Assert.Equal(0, result.GetProperty("anomalies").GetArrayLength());
        Assert.Equal(1, result.GetProperty("readings").GetProperty("pruned").GetProperty("runs").GetInt32());
        Assert.Equal(24, result.GetProperty("readings").GetProperty("pruned").GetProperty("readings").GetInt64());
        Assert.Equal(2, result.GetProperty("readings").GetProperty("pruned").GetProperty("windows").GetInt64());

        (code, stdout, stderr) = Run("audit", "verify", "--db", Target(db), "--exports", exports);
        Assert.True(code == 0, stdout + stderr);
        result = JsonDocument.Parse(stdout).RootElement;
        Assert.Equal(2, result.GetProperty("readings").GetProperty("pruned").GetProperty("windows_checked_against_exports").GetInt64());

        // a reading in the table that a pruned window still covers (id 25–30) edited: still caught, by the export check
        await db.ExecuteRawAsync("UPDATE readings SET value = 9999 WHERE id = 27");
        (code, stdout, _) = Run("audit", "verify", "--db", Target(db), "--exports", exports);
        Assert.Equal(OpsLvp.Cli.Commands.AuditVerifyCommand.AnomalyExitCode, code);
        Assert.Contains("readings_mismatch", stdout, StringComparison.Ordinal);

        // a second run has nothing due: the rest is uncovered or newer than the cutoff
        var again = await new ReadingsPruner(db.Factory, audit, TimeProvider.System).RunAsync(new PruneRequest(s_day1.AddDays(2).AddHours(1), exports));
        Assert.Null(again.Failure);
        Assert.Null(again.Pruned);
    }

    private static async Task EditedExportFile_IsDetectedByVerify(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        var exports = Directory.CreateTempSubdirectory("opslvp-exports-").FullName;
        using var audit = new AuditStore(db.Factory);
        using var store = new ReadingStore(db.Factory);
        await Seed(audit, store);
        var outcome = await new ReadingsPruner(db.Factory, audit, TimeProvider.System).RunAsync(new PruneRequest(s_day1.AddDays(2), exports));
        var pruned = Assert.IsType<PrunedReadings>(outcome.Pruned);
        Assert.Equal(20, pruned.Count);

        // someone lowers one exported value (1800 m → 150 m) and writes the file back in the same format
        var file = Path.Combine(exports, pruned.Files[1].Name);
        var readings = ReadingsExportFormat.Read(file).ToList();
        readings[3] = readings[3] with { Value = 150 };
        await using (var stream = File.Create(file))
        await using (var gzip = new GZipStream(stream, CompressionLevel.Optimal))
        await using (var json = new Utf8JsonWriter(gzip))
        {
            ReadingsExportFormat.WriteHeader(json, DateOnly.FromDateTime(s_day1.AddDays(1).UtcDateTime));
            await json.FlushAsync();
            json.Reset();
            gzip.WriteByte((byte)'\n');
            foreach (var r in readings)
            {
                ReadingsExportFormat.Write(json, r);
                await json.FlushAsync();
                json.Reset();
                gzip.WriteByte((byte)'\n');
            }
        }

        var (code, stdout, stderr) = Run("audit", "verify", "--db", Target(db), "--exports", exports);

        Assert.Equal(OpsLvp.Cli.Commands.AuditVerifyCommand.AnomalyExitCode, code);
        Assert.Equal("", stderr);
        var anomalies = JsonDocument.Parse(stdout).RootElement.GetProperty("anomalies").EnumerateArray().ToList();
        Assert.Contains(anomalies, a => a.GetProperty("kind").GetString() == "export_mismatch" && a.GetProperty("detail").GetString()!.Contains(pruned.Files[1].Name, StringComparison.Ordinal));
        Assert.Contains(anomalies, a => a.GetProperty("kind").GetString() == "readings_mismatch");

        // a removed export file is named too
        File.Delete(Path.Combine(exports, pruned.Files[0].Name));
        (code, stdout, _) = Run("audit", "verify", "--db", Target(db), "--exports", exports);
        Assert.Equal(OpsLvp.Cli.Commands.AuditVerifyCommand.AnomalyExitCode, code);
        Assert.Contains("export_missing", stdout, StringComparison.Ordinal);
    }

    private static async Task FailingExportFolder_DeletesNothing(string provider)
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(provider);
        // a regular file where the export folder should be: the folder cannot be created or written (also as root)
        var blocked = Path.Combine(Directory.CreateTempSubdirectory("opslvp-exports-").FullName, "not-a-folder");
        await File.WriteAllTextAsync(blocked, "invented");
        using var audit = new AuditStore(db.Factory);
        using var store = new ReadingStore(db.Factory);
        await Seed(audit, store);
        var before = await All(db);
        var head = (await audit.GetHeadAsync())!.Sequence;

        var outcome = await new ReadingsPruner(db.Factory, audit, TimeProvider.System).RunAsync(new PruneRequest(s_day1.AddDays(3), Path.Combine(blocked, "exports")));

        Assert.True(outcome.Failed);
        Assert.Contains("export", outcome.Failure, StringComparison.Ordinal);
        Assert.Contains(blocked, outcome.Failure, StringComparison.Ordinal);
        Assert.Null(outcome.Pruned);
        Assert.Equal(before, await All(db));
        Assert.Equal(head, (await audit.GetHeadAsync())!.Sequence);
        Assert.Null(await audit.GetLastOfKindAsync(PrunedReadings.Kind));
        var (code, stdout, stderr) = Run("audit", "verify", "--db", Target(db));
        Assert.True(code == 0, stdout + stderr);
    }

    /// <summary>
    /// 35 invented readings: 10 a day at 15-minute steps on days 1–3 (ids 1–30), two covering entries (ids 1–20 and
    /// 21–30), then 5 more received on day 1 (ids 31–35) that no entry covers yet.
    /// </summary>
    private static async Task Seed(AuditStore audit, ReadingStore store)
    {
        var batch = new List<ReceivedReading>();
        for (var day = 0; day < 3; day++)
        {
            for (var i = 0; i < 10; i++)
            {
                var at = s_day1.AddDays(day).AddMinutes(15 * i);
                batch.Add(i == 7
                    ? new ReceivedReading(at, "push:invented", "rvr-tdz-x", "rvr", at, null, null, false, RejectReason.OutOfRange, "value \"-5\" out of range")
                    : new ReceivedReading(at, "push:invented", "rvr-tdz-x", "rvr", at, 1800 - (100 * i) + 0.5, "ok", true));
            }
        }
        await store.InsertAsync(batch);
        await Cover(audit, store, 0, 20, s_day1.AddDays(1).AddHours(5));
        await Cover(audit, store, 20, 30, s_day1.AddDays(2).AddHours(5));
        var late = Enumerable.Range(0, 5).Select(i => new ReceivedReading(s_day1.AddMinutes(i), "sim", "vis-x", "visibility", s_day1.AddMinutes(i), 5000, "ok", true)).ToList();
        await store.InsertAsync(late);
    }

    private static async Task Cover(AuditStore audit, ReadingStore store, long after, long to, DateTimeOffset at)
    {
        var coverage = await store.CoverAsync(after, to);
        await audit.AppendAsync([new NewAuditEntry("engine", "transition", coverage.AddTo("{\"from\":\"normal\",\"to\":\"preparation\",\"note\":\"invented\"}"), at)]);
    }

    private static async Task<List<ExportedReading>> All(ProviderDatabase db)
    {
        await using var context = db.Factory.CreateDbContext();
        var rows = await context.Readings.AsNoTracking().OrderBy(r => r.Id).ToListAsync();
        return rows.ConvertAll(ExportedReading.From);
    }

    private static string Target(ProviderDatabase db) =>
        db.IsPostgres ? db.ConnectionString : new Microsoft.Data.Sqlite.SqliteConnectionStringBuilder(db.ConnectionString).DataSource;

    private static (int Code, string Stdout, string Stderr) Run(params string[] args)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    private sealed class PrunedComparer : IEqualityComparer<PrunedReadings?>
    {
        public bool Equals(PrunedReadings? x, PrunedReadings? y) =>
            x is not null && y is not null && x.After == y.After && x.To == y.To && x.Count == y.Count && x.Cutoff == y.Cutoff && x.Files.SequenceEqual(y.Files);

        public int GetHashCode(PrunedReadings? obj) => 0;
    }
}
