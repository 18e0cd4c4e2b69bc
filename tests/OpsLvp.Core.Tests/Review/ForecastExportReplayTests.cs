using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;
using OpsLvp.Core.Tests.Engine.Replay;

namespace OpsLvp.Core.Tests.Review;

/// <summary>
/// An episode started by a forecast replays from its export to the same transitions and flag changes (docs/review.md
/// "Forecasts"): the export carries the recorded forecast_received events and its replay feeds them back in. Scenario
/// files invented (Scenarios/forecast-*), settings illustrative.
/// </summary>
public sealed class ForecastExportReplayTests
{
    [Fact]
    public void ExportOfAForecastEpisode_ReplaysToTheRecordedTransitionsAndFlagChanges()
    {
        var profile = ProfileLoader.Load(ReplayScenarioTests.Scenario("xdmo-forecast-profile.json"));
        var readingsFile = ReplayScenarioTests.Scenario("forecast-clear-night.readings.csv");
        var forecastsFile = ReplayScenarioTests.Scenario("forecast-amended.forecasts.csv");
        IReadOnlyList<Reading> readings = ReadingsCsv.Parse(File.ReadAllText(readingsFile), readingsFile);
        var live = ReplayRunner.Run(profile, readings, [], ForecastsCsv.Parse(File.ReadAllText(forecastsFile), forecastsFile));
        var events = live.Events.Select(RecordedEvent.FromEvent).ToList();
        var summary = Assert.Single(EpisodeModel.Build(events, readings, readings[^1].Time));
        Assert.NotNull(summary.ForecastLead);

        var export = EpisodeExport.Create(summary, profile, readings, events, []);
        Assert.Equal(2, EpisodeExport.ForecastsOf(export.Events).Count);
        var replayed = export.Replay().Events.Select(RecordedEvent.FromEvent).ToList();
        static IEnumerable<string> Key(IEnumerable<RecordedEvent> e) =>
            e.Where(x => x.Name is "transition" or "forecast_flag_changed" or "forecast_received").Select(x => x.Json);
        Assert.Equal(Key(export.Events), Key(replayed));
    }
}
