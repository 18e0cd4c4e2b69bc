using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Review;
using OpsLvp.Web.Tests.Persistence;

namespace OpsLvp.Web.Tests.Review;

/// <summary>
/// The review over a real database written the way the engine host writes it (AuditEvents.ToEntry for every audited
/// event, raw readings plus derived RVR in the readings table), for the invented demo night.
/// </summary>
public sealed class StoreEpisodeSourceTests
{
    [Fact]
    public async Task DatabaseWrittenLikeTheHost_GivesTheEpisode_AndAnExportThatReplaysToIt()
    {
        var record = DemoNightSource.Record;
        var derived = ReviewReadings.WithDerivedRvr(record.Profile!, record.Readings).Except(record.Readings)
            .Select(r => ReceivedReading.Accept(r, r.Time, "sim:derived"));
        using var db = await NightDatabase.WriteAsync(record.Profile!, record.Profile!, [], [.. Received(record.Readings), .. derived]);
        var services = db.Services;
        var review = new ReviewService(new StoreEpisodeSource(services), new FakeTimeProvider(new DateTimeOffset(2026, 1, 16, 6, 0, 0, TimeSpan.Zero)));

        var (episodes, loaded) = await review.ListAsync();

        Assert.True(loaded.Chain.Ok, loaded.Chain.Detail);
        var episode = Assert.Single(episodes);
        // Received (here: at their own time) within the episode's window: lead-in and receipt margin before, margin after.
        var from = episode.Start - EpisodeExport.LeadIn(record.Profile!) - StoreEpisodeSource.ReceiptMargin;
        var to = episode.End!.Value + StoreEpisodeSource.ReceiptMargin;
        Assert.Equal(record.Readings.Where(r => r.Time >= from && r.Time < to), loaded.Readings);
        var view = await review.GetAsync(episode.Id);
        Assert.NotNull(view);
        Assert.True(view.Verifies);
        var replayed = view.Export.Replay().Events.Select(RecordedEvent.FromEvent).Where(e => e.Name == "transition").Select(e => e.Json);
        Assert.Equal(view.Export.Events.Where(e => e.Name == "transition").Select(e => e.Json), replayed);
        Assert.Equal(4, view.Summary.Transitions.Count);
    }

    [Fact]
    public async Task OnlyReadingsAroundEpisodes_AreRead_NotTheWholeTable()
    {
        var record = DemoNightSource.Record;
        var episode = Assert.Single(EpisodeModel.Bounds(record.Events));
        var sensor = record.Profile!.Sensors[0].Id;
        // Invented readings a week before and a week after the night, far outside any episode's window.
        var farBefore = new Reading(episode.Start.AddDays(-7), sensor, ReadingKind.Rvr, 1999);
        var farAfter = new Reading(episode.End!.Value.AddDays(7), sensor, ReadingKind.Rvr, 1998);
        using var db = await NightDatabase.WriteAsync(record.Profile!, record.Profile!, [], [.. Received([farBefore]), .. Received(record.Readings), .. Received([farAfter])]);
        var services = db.Services;

        var loaded = await new StoreEpisodeSource(services).LoadAsync();

        Assert.DoesNotContain(farBefore, loaded.Readings);
        Assert.DoesNotContain(farAfter, loaded.Readings);
        var leadInStart = episode.Start - EpisodeExport.LeadIn(record.Profile!);
        Assert.Contains(loaded.Readings, r => r.Time <= leadInStart);
        Assert.Equal(record.Readings.Where(r => r.Time >= leadInStart && r.Time <= episode.End), loaded.Readings.Where(r => r.Time >= leadInStart && r.Time <= episode.End));
    }

    [Fact]
    public async Task AnEpisode_IsJudgedByTheProfileRecordedBeforeIt_NotTheOneLoadedNow()
    {
        var record = DemoNightSource.Record;
        var episode = Assert.Single(EpisodeModel.Bounds(record.Events));
        // The night ran under an invented earlier version; today's profile has another version and a longer dwell.
        var then = record.Profile! with { Version = "demo-night-then (invented)" };
        var now = record.Profile! with
        {
            Version = "demo-now (invented)",
            Thresholds = record.Profile!.Thresholds with { Active = record.Profile!.Thresholds.Active with { EnterDwellSeconds = 900 } },
        };
        using var db = await NightDatabase.WriteAsync(then, now, [ProfileRecord.Entry(then, episode.Start.AddHours(-3))], Received(record.Readings));
        var services = db.Services;
        var review = new ReviewService(new StoreEpisodeSource(services), new FakeTimeProvider(new DateTimeOffset(2026, 1, 16, 6, 0, 0, TimeSpan.Zero)));

        var (episodes, loaded) = await review.ListAsync();
        var view = await review.GetAsync(Assert.Single(episodes).Id);

        Assert.Equal("demo-night-then (invented)", Assert.Single(loaded.Profiles!).Profile.Version);
        Assert.NotNull(view);
        Assert.Equal("demo-night-then (invented)", view.Export.Profile.Version);
        // Replayed under its own profile, the export reaches the transitions that were recorded.
        var replayed = view.Export.Replay().Events.Select(RecordedEvent.FromEvent).Where(e => e.Name == "transition").Select(e => e.Json);
        Assert.Equal(view.Export.Events.Where(e => e.Name == "transition").Select(e => e.Json), replayed);
    }

    [Fact]
    public void ProfileAt_TakesTheLastRecordedAtOrBefore_ElseTheOneLoadedNow()
    {
        var current = DemoNightSource.Record.Profile! with { Version = "now (invented)" };
        var a = current with { Version = "a (invented)" };
        var b = current with { Version = "b (invented)" };
        var t = new DateTimeOffset(2026, 1, 15, 0, 0, 0, TimeSpan.Zero);
        var record = new ReviewRecord(current, [], [], [], Core.Audit.AuditChain.Verify([]), [(t, a), (t.AddDays(1), b)]);

        Assert.Equal("now (invented)", record.ProfileAt(t.AddSeconds(-1))!.Version);
        Assert.Equal("a (invented)", record.ProfileAt(t)!.Version);
        Assert.Equal("a (invented)", record.ProfileAt(t.AddHours(23))!.Version);
        Assert.Equal("b (invented)", record.ProfileAt(t.AddDays(3))!.Version);
        Assert.Equal("now (invented)", (record with { Profiles = null }).ProfileAt(t.AddDays(3))!.Version);
    }

    [Fact]
    public void ReadingWindows_OnePerEpisode_OverlapsMerged_AnOpenEpisodeToTheEnd()
    {
        var t = new DateTimeOffset(2026, 1, 15, 0, 0, 0, TimeSpan.Zero);
        static RecordedEvent Ev(string name, string id, DateTimeOffset at) =>
            RecordedEvent.Parse($$"""{"event":"{{name}}","time":"{{at.UtcDateTime:yyyy-MM-ddTHH:mm:ssZ}}","episode":"{{id}}"}""");
        var events = new[]
        {
            Ev("episode_started", "e1", t), Ev("episode_ended", "e1", t.AddHours(2)),
            Ev("episode_started", "e2", t.AddHours(3)), Ev("episode_ended", "e2", t.AddHours(4)),
            Ev("episode_started", "e3", t.AddDays(2)),
        };
        var leadIn = TimeSpan.FromMinutes(30);
        var m = StoreEpisodeSource.ReceiptMargin;

        var windows = StoreEpisodeSource.ReadingWindows(events, leadIn);

        // e1 and e2 overlap once widened (e2 from 3 h − 30 min − 1 h = 1.5 h < 2 h + 1 h): one window.
        Assert.Equal([(t - leadIn - m, t.AddHours(4) + m), (t.AddDays(2) - leadIn - m, DateTimeOffset.MaxValue)], windows);
        Assert.Empty(StoreEpisodeSource.ReadingWindows([], leadIn));
    }

    private static List<ReceivedReading> Received(IEnumerable<Reading> readings) =>
        readings.Select(r => ReceivedReading.Accept(r, r.Time, "sim")).ToList();

    /// <summary>
    /// A real database written the way the engine host writes it (<see cref="WriteAsync"/>), and services with its
    /// stores and a profile loaded now.
    /// </summary>
    private sealed class NightDatabase : IDisposable
    {
        private readonly TempDatabase _db;
        private readonly AuditStore _audit;
        private readonly ReadingStore _readings;

        private NightDatabase(TempDatabase db, AerodromeProfile loadedNow)
        {
            _db = db;
            _audit = new AuditStore(db.Factory);
            _readings = new ReadingStore(db.Factory);
            Services = new ServiceCollection().AddSingleton(loadedNow).AddSingleton(_audit).AddSingleton(_readings).BuildServiceProvider();
        }

        public IServiceProvider Services { get; }

        /// <summary>The demo night replayed under <paramref name="ranUnder"/>, its audited events after <paramref name="before"/>, and <paramref name="received"/>.</summary>
        public static async Task<NightDatabase> WriteAsync(AerodromeProfile ranUnder, AerodromeProfile loadedNow, IReadOnlyList<NewAuditEntry> before, IReadOnlyList<ReceivedReading> received)
        {
            var night = new NightDatabase(await TempDatabase.CreateMigratedAsync(), loadedNow);
            var record = DemoNightSource.Record;
            var events = ReplayRunner.Run(ranUnder, record.Readings, RecordedCommands.ToCommands(RecordedCommands.FromEvents(record.Events), "demo")).Events;
            await night._audit.AppendAsync([.. before, .. events.Where(AuditEvents.IsAudited).Select(AuditEvents.ToEntry)]);
            await night._readings.InsertAsync(received);
            return night;
        }

        public void Dispose()
        {
            _audit.Dispose();
            _readings.Dispose();
            _db.Dispose();
        }
    }
}
