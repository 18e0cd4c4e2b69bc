using OpsLvp.Core.Engine;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Review;
using OpsLvp.Core.Tests.Engine;

namespace OpsLvp.Core.Tests.Review;

/// <summary>
/// The episode summary's forecast lead (docs/review.md "Forecasts"): how early preparation started compared with the first
/// forecast that called for it, from the recorded events of an engine run. Everything invented for the invented XDMO;
/// settings illustrative (<see cref="ForecastEngineTests.Settings"/>). T0 is 1 Dec 0300Z.
/// </summary>
public sealed class ForecastLeadTests
{
    private static IReadOnlyList<RecordedEvent> Recorded(EngineDriver d) => d.Events.Select(RecordedEvent.FromEvent).ToList();

    [Fact]
    public void TafBeforeTheEpisode_GivesTheLeadAfterTheCallAndAheadOfTheWindow()
    {
        var d = new EngineDriver(ForecastEngineTests.Profile());
        d.Weather(0, 2000);
        d.Run(600, new ForecastInput(ForecastOrigin.Taf, "TAF XDMO 010250Z 0103/0203 24005KT 9999 SCT030 TEMPO 0105/0108 0300 FG VV002", EngineDriver.At(600)));
        d.WeatherFromTo(660, 900, 2000);
        var summary = Assert.Single(EpisodeModel.Build(Recorded(d), [], EngineDriver.At(900)));
        Assert.Equal(EngineDriver.At(630), summary.Start); // the 30 s preparation dwell (illustrative)
        var lead = summary.ForecastLead!;
        Assert.Equal(EngineDriver.At(600), lead.CalledAt);
        Assert.Equal("TAF 0500–0800 TEMPO 0300 FG VV002", lead.Source);
        Assert.Equal(TimeSpan.FromSeconds(30), lead.AfterCall);
        Assert.Equal(EngineDriver.At(7200) - EngineDriver.At(630), lead.AheadOfWindow);
        Assert.Equal("preparation started 30 s after TAF 0500–0800 TEMPO 0300 FG VV002 called for it (03:10Z), 1 h 49 min before its window began (05:00Z)", lead.Describe());
        Assert.Equal(0, summary.ForecastsReceived); // received before the episode started
    }

    [Fact]
    public void PreparationFromObservedRvr_BeforeAnyForecast_SaysTheForecastCameLater()
    {
        var d = new EngineDriver(ForecastEngineTests.Profile());
        d.WeatherFromTo(0, 60, 800); // below the 1000 m preparation value (illustrative): preparation at 30 s
        d.Run(120, new ForecastInput(ForecastOrigin.Taf, "TAF XDMO 010300Z 0103/0203 0600 BR BKN004 TEMPO 0103/0106 0200 FG", EngineDriver.At(120)));
        var summary = Assert.Single(EpisodeModel.Build(Recorded(d), [], EngineDriver.At(200)));
        var lead = summary.ForecastLead!;
        Assert.Equal(TimeSpan.FromSeconds(-90), lead.AfterCall);
        Assert.StartsWith("preparation started 1 min 30 s before TAF 0300–", lead.Describe(), StringComparison.Ordinal);
        Assert.Equal(1, summary.ForecastsReceived);
    }

    [Fact]
    public void NoForecast_NoLead()
    {
        var d = new EngineDriver(ForecastEngineTests.Profile());
        d.WeatherFromTo(0, 60, 800);
        Assert.Null(Assert.Single(EpisodeModel.Build(Recorded(d), [], EngineDriver.At(60))).ForecastLead);
    }

    [Fact]
    public void FlagClearedBeforeTheEpisode_DoesNotCount()
    {
        var d = new EngineDriver(ForecastEngineTests.Profile());
        d.Weather(0, 2000);
        d.Run(10, new ForecastInput(ForecastOrigin.Taf, "TAF XDMO 010250Z 0103/0203 24005KT 9999 SCT030 TEMPO 0105/0108 0300 FG VV002", EngineDriver.At(10)));
        d.Run(20, new SetForecast("dm (invented)", false, "not expected (invented)"));
        d.WeatherFromTo(60, 600, 800);
        var summary = Assert.Single(EpisodeModel.Build(Recorded(d), [], EngineDriver.At(600)));
        Assert.Null(summary.ForecastLead);
    }
}
