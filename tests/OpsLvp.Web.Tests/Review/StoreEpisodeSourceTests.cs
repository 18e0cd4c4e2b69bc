using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using OpsLvp.Core.Engine.Replay;
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
        using var db = await TempDatabase.CreateMigratedAsync();
        var record = DemoNightSource.Record;
        using var audit = new AuditStore(db.Factory);
        using var readings = new ReadingStore(db.Factory);
        var engineEvents = ReplayRunner.Run(record.Profile!, record.Readings,
            RecordedCommands.ToCommands(RecordedCommands.FromEvents(record.Events), "demo")).Events;
        var entries = engineEvents.Where(AuditEvents.IsAudited).Select(AuditEvents.ToEntry).ToList();
        await audit.AppendAsync(entries);
        var received = record.Readings.Select(r => ReceivedReading.Accept(r, r.Time, "sim")).ToList();
        var derived = ReviewReadings.WithDerivedRvr(record.Profile!, record.Readings).Except(record.Readings)
            .Select(r => ReceivedReading.Accept(r, r.Time, "sim:derived"));
        await readings.InsertAsync([.. received, .. derived]);

        var services = new ServiceCollection()
            .AddSingleton(record.Profile!)
            .AddSingleton(audit)
            .AddSingleton(readings)
            .BuildServiceProvider();
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
        using var db = await TempDatabase.CreateMigratedAsync();
        var record = DemoNightSource.Record;
        using var audit = new AuditStore(db.Factory);
        using var readings = new ReadingStore(db.Factory);
        var engineEvents = ReplayRunner.Run(record.Profile!, record.Readings,
            RecordedCommands.ToCommands(RecordedCommands.FromEvents(record.Events), "demo")).Events;
        await audit.AppendAsync(engineEvents.Where(AuditEvents.IsAudited).Select(AuditEvents.ToEntry).ToList());
        var episode = Assert.Single(EpisodeModel.Bounds(record.Events));
        var sensor = record.Profile!.Sensors[0].Id;
        // Invented readings a week before and a week after the night, far outside any episode's window.
        var farBefore = new Reading(episode.Start.AddDays(-7), sensor, ReadingKind.Rvr, 1999);
        var farAfter = new Reading(episode.End!.Value.AddDays(7), sensor, ReadingKind.Rvr, 1998);
        await readings.InsertAsync([
            ReceivedReading.Accept(farBefore, farBefore.Time, "sim"),
            .. record.Readings.Select(r => ReceivedReading.Accept(r, r.Time, "sim")),
            ReceivedReading.Accept(farAfter, farAfter.Time, "sim"),
        ]);
        var services = new ServiceCollection().AddSingleton(record.Profile!).AddSingleton(audit).AddSingleton(readings).BuildServiceProvider();

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
        using var db = await TempDatabase.CreateMigratedAsync();
        var record = DemoNightSource.Record;
        using var audit = new AuditStore(db.Factory);
        using var readings = new ReadingStore(db.Factory);
        var episode = Assert.Single(EpisodeModel.Bounds(record.Events));
        // The night ran under an invented earlier version; today's profile has another version and a longer dwell.
        var then = record.Profile! with { Version = "demo-night-then (invented)" };
        var now = record.Profile! with
        {
            Version = "demo-now (invented)",
            Thresholds = record.Profile!.Thresholds with { Active = record.Profile!.Thresholds.Active with { EnterDwellSeconds = 900 } },
        };
        var engineEvents = ReplayRunner.Run(then, record.Readings, RecordedCommands.ToCommands(RecordedCommands.FromEvents(record.Events), "demo")).Events;
        await audit.AppendAsync([ProfileRecord.Entry(then, episode.Start.AddHours(-3)), .. engineEvents.Where(AuditEvents.IsAudited).Select(AuditEvents.ToEntry)]);
        await readings.InsertAsync(record.Readings.Select(r => ReceivedReading.Accept(r, r.Time, "sim")).ToList());
        var services = new ServiceCollection().AddSingleton(now).AddSingleton(audit).AddSingleton(readings).BuildServiceProvider();
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
}
