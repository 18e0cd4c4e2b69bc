using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Core.Readings;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// The demo (its simulator on the invented demo night, seed-demo/, aerodrome XDMO) stopped and started again as a demo
/// on its own data folder: it continues from its recorded phase and goes on recording, with one
/// <c>clock_regression</c> entry at the restart because its accelerated clock starts again from the real time
/// (docs/reliability.md "Clock regression", "Demo on an existing data folder").
/// </summary>
public sealed class DemoRestartTests
{
    /// <summary>How far the first run's demo clock must lead the real one before it is stopped.</summary>
    private static readonly TimeSpan s_lead = TimeSpan.FromMinutes(10);

    /// <summary>How far the newest accepted reading's demo time is ahead of the real clock.</summary>
    private static TimeSpan LeadOf(IEnumerable<ReceivedReading> stored) =>
        stored.Where(r => r.Accepted && r.Time is not null).Select(r => r.Time!.Value).DefaultIfEmpty(DateTimeOffset.MinValue).Max() - DateTimeOffset.UtcNow;

    private static Dictionary<string, string?> DemoSettings() => new()
    {
        ["Demo:Simulator"] = "On",
        ["Demo:Speed"] = "60",
        ["Engine:TickInterval"] = "00:00:00.200",
    };

    [Fact]
    public async Task DemoStoppedAndStartedAgainOnItsFolder_KeepsRecording_WithOneClockRegressionEntry()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            int firstRun;
            DateTimeOffset engineTimeAtStop;
            await using (var app = OpsLvpApp.Start(DemoSettings(), folder))
            {
                // let it record until its demo clock is well ahead of the real one (x60: 10 s real are 10 demo minutes),
                // further than a slow restart can take to its first evaluation, so the restart finds its time ahead
                await Eventually.TrueAsync(() => AcceptedDemoReadings(app).Result >= 100 && LeadOf(StoredAsync(app).Result) > s_lead,
                    "the demo to record 100 readings and its clock to lead the real one by 10 minutes", TimeSpan.FromSeconds(120));
                firstRun = (await StoredAsync(app)).Count;
                engineTimeAtStop = (await LiveClient.StateAsync(app)).GetProperty("at").GetDateTimeOffset();
            }
            SqliteConnection.ClearAllPools();
            Assert.True(engineTimeAtStop > DateTimeOffset.UtcNow.AddMinutes(2), $"the demo clock was not ahead at the stop ({engineTimeAtStop:o})");

            await using var second = OpsLvpApp.Start(DemoSettings(), folder);
            await Eventually.TrueAsync(() => StoredAsync(second).Result.Skip(firstRun).Count(r => r.Accepted && !r.IsDerived) >= 100,
                "the restarted demo to record 100 more readings", TimeSpan.FromSeconds(120));

            var after = (await StoredAsync(second)).Skip(firstRun).ToList();
            Assert.DoesNotContain(after, r => r.RejectReason == RejectReason.OlderThanLatest);
            Assert.True(after.Count(r => r.Accepted) >= 0.9 * after.Count, $"{after.Count(r => !r.Accepted)} of {after.Count} readings after the restart were refused");
            var entries = await LiveClient.EntriesAsync(second);
            Assert.Equal(2, entries.Count(e => e.Kind == "engine_started"));
            var regression = Assert.Single(entries, e => e.Kind == "clock_regression");
            Assert.True(regression.Sequence > entries.Where(e => e.Kind == "engine_started").Max(e => e.Sequence) - 5, "the clock_regression entry is not at the restart");
            await LiveClient.AssertChainVerifiesAsync(second);
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task DemoKilledAndStartedAgainOnItsFolder_KeepsRecording()
    {
        // the server as its own process, killed with SIGKILL while the demo plays, then started again as a demo
        var folder = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(folder);
        var database = Path.Combine(folder, "opslvp.db");
        var profile = RepositoryFile("seed-demo", "profile.json");
        var settings = new Dictionary<string, string>
        {
            ["Demo__Simulator"] = "On",
            ["Demo__Speed"] = "60",
        };
        try
        {
            int firstRun;
            using (var server = await OpsLvp.FaultCases.ServerProcess.StartAsync(folder, profile, settings))
            {
                // the stored state's time, not the newest reading's: after a kill the engine restores the state row,
                // whose evaluation time and latest readings are flushed every Engine:StateFlushInterval (10 s real,
                // 10 demo minutes here), so it can lag the newest reading by that much
                await Eventually.TrueAsync(() => Stored(database).Count(r => r.Accepted && !r.IsDerived) >= 100 && StoredStateLead(database) > s_lead,
                    "the demo to record 100 readings and its stored state to lead the real clock by 10 minutes", TimeSpan.FromSeconds(120));
                server.Kill();
                firstRun = Stored(database).Count;
            }

            using var again = await OpsLvp.FaultCases.ServerProcess.StartAsync(folder, profile, settings);
            await Eventually.TrueAsync(() => Stored(database).Skip(firstRun).Count(r => r.Accepted && !r.IsDerived) >= 100,
                "the restarted demo to record 100 more readings", TimeSpan.FromSeconds(120));
            var after = Stored(database).Skip(firstRun).ToList();
            Assert.DoesNotContain(after, r => r.RejectReason == RejectReason.OlderThanLatest);
            Assert.True(after.Count(r => r.Accepted) >= 0.9 * after.Count, $"{after.Count(r => !r.Accepted)} of {after.Count} readings after the restart were refused");
            using var facts = new OpsLvp.FaultCases.StoredFacts(database);
            Assert.Single(await facts.EntriesOfKindAsync("clock_regression"));
            Assert.Null(await facts.CheckChainAsync([]));
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }

    /// <summary>How far the stored engine state's evaluation time is ahead of the real clock (read as <see cref="Stored"/> is).</summary>
    private static TimeSpan StoredStateLead(string database)
    {
        if (!File.Exists(database))
        {
            return TimeSpan.MinValue;
        }
        using var audit = new AuditStore(new OpsLvp.Data.OpsLvpDbContextFactory(OpsLvp.Data.OpsLvpDatabase.SqliteOptions($"Data Source={database};Pooling=False")));
        try
        {
            return audit.GetLatestStateAsync().GetAwaiter().GetResult() is { } stored
                ? OpsLvp.Web.Engine.EngineStateJson.Deserialize(stored.StateJson).EvaluatedAt - DateTimeOffset.UtcNow
                : TimeSpan.MinValue;
        }
        catch (SqliteException)
        {
            return TimeSpan.MinValue; // not created yet
        }
    }

    /// <summary>The readings table read on a connection of its own, not pooled (the server is another process).</summary>
    private static List<ReceivedReading> Stored(string database)
    {
        if (!File.Exists(database))
        {
            return [];
        }
        using var store = new ReadingStore(new OpsLvp.Data.OpsLvpDbContextFactory(OpsLvp.Data.OpsLvpDatabase.SqliteOptions($"Data Source={database};Pooling=False")));
        try
        {
            return [.. store.GetReceivedAsync(DateTimeOffset.UnixEpoch, DateTimeOffset.UtcNow.AddYears(1)).GetAwaiter().GetResult()];
        }
        catch (SqliteException)
        {
            return []; // not created yet
        }
    }

    private static string RepositoryFile(params string[] parts)
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            var path = Path.Combine([dir.FullName, .. parts]);
            if (File.Exists(path))
            {
                return path;
            }
        }
        throw new FileNotFoundException(string.Join('/', parts));
    }

    private static async Task<int> AcceptedDemoReadings(OpsLvpApp app) => (await StoredAsync(app)).Count(r => r.Accepted && !r.IsDerived);

    private static async Task<IReadOnlyList<ReceivedReading>> StoredAsync(OpsLvpApp app) =>
        await app.Services.GetRequiredService<ReadingStore>().GetReceivedAsync(DateTimeOffset.UnixEpoch, DateTimeOffset.UtcNow.AddYears(1));
}
