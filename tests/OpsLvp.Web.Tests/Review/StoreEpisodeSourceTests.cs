using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using OpsLvp.Core.Engine.Replay;
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
        Assert.Equal(record.Readings.Count, loaded.Readings.Count);
        var episode = Assert.Single(episodes);
        var view = await review.GetAsync(episode.Id);
        Assert.NotNull(view);
        Assert.True(view.Verifies);
        var replayed = view.Export.Replay().Events.Select(RecordedEvent.FromEvent).Where(e => e.Name == "transition").Select(e => e.Json);
        Assert.Equal(view.Export.Events.Where(e => e.Name == "transition").Select(e => e.Json), replayed);
        Assert.Equal(4, view.Summary.Transitions.Count);
    }
}
