using OpsLvp.Core.Engine;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// Forecasts as engine inputs and the forecast flag (docs/engine.md R25–R29). Change-group meanings: WMO-No. 306 FM 51 /
/// FM 15 and ICAO Annex 3 (from memory, docs/sources.md "Forecasts"); preparation starting when low visibility is forecast:
/// EUR Doc 013 (from memory). Every TAF and METAR here is invented for the invented aerodrome XDMO; the deterioration
/// values (1000 m, 300 ft), the 3 h horizon and the counted groups are invented and illustrative. T0 is 1 Dec 0300Z.
/// </summary>
public sealed class ForecastEngineTests
{
    public static ForecastSettings Settings(bool tempo = true, bool prob30 = false, bool prob40 = true) => new()
    {
        HorizonMinutes = 180,
        VisibilityBelowM = 1000,
        CeilingBelowFt = 300,
        CountTempo = tempo,
        CountProb30 = prob30,
        CountProb40 = prob40,
    };

    public static AerodromeProfile Profile(ForecastSettings? settings = null) => TestProfiles.Standard() with { Forecast = settings ?? Settings() };

    private static ForecastInput Taf(double seconds, string text) => new(ForecastOrigin.Taf, text, EngineDriver.At(seconds));

    private static ForecastInput Trend(double seconds, string metar) => new(ForecastOrigin.Trend, metar, EngineDriver.At(seconds));

    private const double Hour = 3600;

    // Issued 0250Z, valid 0103/0203; TEMPO fog 0500–0800 is within the 3 h horizon from 0300.
    private const string TempoFog = "TAF XDMO 010250Z 0103/0203 24005KT 9999 SCT030 TEMPO 0105/0108 0300 FG VV002";

    [Fact]
    public void TafForecastingFogWithinTheHorizon_SetsTheFlagWithItsSource_AndPreparationFollows()
    {
        var d = new EngineDriver(Profile());
        var events = d.Run(0, Taf(0, TempoFog));
        var received = Assert.Single(events.OfType<ForecastReceived>());
        Assert.Equal(EngineDriver.At(-10 * 60), received.IssuedAt);
        var changed = Assert.Single(events.OfType<ForecastFlagChanged>());
        Assert.True(changed.On);
        Assert.False(changed.Manual);
        Assert.Equal("TAF 0500–0800 TEMPO 0300 FG VV002", changed.Source);
        Assert.True(d.State.DeteriorationForecast);
        var source = d.State.ForecastSource!;
        Assert.Equal(TempoFog, source.ReportText);
        Assert.Equal("TEMPO 0105/0108 0300 FG VV002", source.Group);
        Assert.Equal(EngineDriver.At(2 * Hour), source.From);
        Assert.Equal(EngineDriver.At(5 * Hour), source.Until);
        // readings well above every threshold: only the forecast asks for preparation (R4), after its 30 s dwell
        d.Weather(10, 2000);
        d.Weather(40, 2000);
        var transition = Assert.Single(d.Transitions);
        Assert.Equal(Phase.Preparation, transition.To);
        Assert.Equal(EngineDriver.At(30), transition.At);
    }

    [Fact]
    public void GroupBeyondTheHorizon_TurnsTheFlagOnWhenItEntersTheHorizon_WithoutAnyInput()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Taf(0, "TAF XDMO 010250Z 0103/0203 24005KT 9999 SCT030 TEMPO 0108/0111 0300 FG"));
        Assert.False(d.State.DeteriorationForecast);
        var status = d.Engine.Describe(d.State, EngineDriver.At(60));
        // the look-ahead [now, now + 3 h) holds 0800 from just after 0500: the engine's next second (R7, R29)
        Assert.Equal(EngineDriver.At(2 * Hour + 1), status.Forecast!.NextOnAt);
        Assert.Equal(EngineDriver.At(5 * Hour), status.Forecast.NextOnWindowFrom);
        Assert.Equal("TAF 0800–1100 TEMPO 0300 FG", status.Forecast.NextOnShortForm);
        d.Run(3 * Hour);
        var on = Assert.Single(d.Events.OfType<ForecastFlagChanged>());
        Assert.True(on.On);
        Assert.Equal(EngineDriver.At(2 * Hour + 1), on.At); // stamped at that instant with no input (R7, R28)
    }

    [Fact]
    public void ExpiredTaf_DropsTheFlagAtTheEndOfItsValidity_WithoutAnyInput()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Taf(0, "TAF XDMO 010000Z 0101/0104 0300 FG VV002"));
        Assert.True(d.State.DeteriorationForecast);
        d.Run(2 * Hour);
        var off = d.Events.OfType<ForecastFlagChanged>().Last();
        Assert.False(off.On);
        Assert.Equal(EngineDriver.At(Hour), off.At);
        Assert.Empty(d.State.Forecasts);
        Assert.Null(d.State.ForecastSource);
    }

    [Fact]
    public void TafAlreadyExpiredOnArrival_IsRejected_AndNeverCounts()
    {
        var d = new EngineDriver(Profile());
        var events = d.Run(0, Taf(0, "TAF XDMO 302100Z 3022/0102 0300 FG"));
        Assert.Contains("expired", Assert.Single(events.OfType<ForecastRejected>()).Reason, StringComparison.Ordinal);
        Assert.False(d.State.DeteriorationForecast);
        Assert.Empty(d.State.Forecasts);
    }

    [Fact]
    public void AmendedTafThatNoLongerForecastsFog_ClearsTheFlag()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Taf(0, TempoFog));
        Assert.True(d.State.DeteriorationForecast);
        var events = d.Run(20 * 60, Taf(20 * 60, "TAF AMD XDMO 010315Z 0103/0203 24008KT 9999 SCT040"));
        var off = Assert.Single(events.OfType<ForecastFlagChanged>());
        Assert.False(off.On);
        Assert.Equal(EngineDriver.At(20 * 60), off.At);
        Assert.False(d.State.DeteriorationForecast);
    }

    [Theory]
    [InlineData("TEMPO 0104/0106 0300 FG", true, false, true)]
    [InlineData("TEMPO 0104/0106 0300 FG", false, false, false)]
    [InlineData("BECMG 0104/0106 0300 FG", false, false, true)]
    [InlineData("PROB30 0104/0106 0300 FG", true, false, false)]
    [InlineData("PROB30 0104/0106 0300 FG", true, true, true)]
    [InlineData("PROB30 TEMPO 0104/0106 0300 FG", false, true, false)]
    public void CountedGroups_FollowTheProfile(string group, bool tempo, bool prob30, bool on)
    {
        var d = new EngineDriver(Profile(Settings(tempo, prob30)));
        d.Run(0, Taf(0, $"TAF XDMO 010250Z 0103/0203 24005KT 9999 SCT030 {group}"));
        Assert.Equal(on, d.State.DeteriorationForecast);
    }

    [Fact]
    public void ManualClear_WinsOverTheForecastUntilReleased()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Taf(0, TempoFog));
        d.Run(60, new SetForecast("dm (invented)", false, "fog not expected, local judgement (invented)"));
        Assert.False(d.State.DeteriorationForecast);
        Assert.True(d.State.ForecastSource!.Manual);
        d.Run(3 * Hour); // the TEMPO window itself passes: still cleared by hand
        Assert.False(d.State.DeteriorationForecast);
        d.Run(3 * Hour + 60, new ReleaseForecast("dm (invented)", "forecast again (invented)"));
        Assert.True(d.State.DeteriorationForecast);
        Assert.Null(d.State.ManualForecast);
        Assert.Equal("TAF 0500–0800 TEMPO 0300 FG VV002", d.State.ForecastSource!.ShortForm);
        Assert.Contains(d.Events.OfType<ManualActionApplied>(), m => m.Action == "release_forecast");
    }

    [Fact]
    public void ManualSetting_EndsWhenANewerForecastArrives_NotAnOlderOne()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, new SetForecast("dm (invented)", true, "fog expected, local judgement (invented)"));
        Assert.True(d.State.DeteriorationForecast);
        // a TAF issued 0250Z, before the setting at 0300, arrives late: the manual setting stays
        var late = d.Run(60, Taf(60, "TAF XDMO 010250Z 0103/0203 24005KT 9999 SCT030"));
        Assert.Null(Assert.Single(late.OfType<ForecastReceived>()).Note);
        Assert.True(d.State.DeteriorationForecast);
        Assert.NotNull(d.State.ManualForecast);
        // the 0320Z METAR's NOSIG trend is newer: the flag follows the forecasts again, and they forecast no fog
        var newer = d.Run(20 * 60, Trend(20 * 60, "METAR XDMO 010320Z 24005KT 9999 SCT030 08/05 Q1020 NOSIG"));
        Assert.NotNull(Assert.Single(newer.OfType<ForecastReceived>()).Note);
        Assert.Null(d.State.ManualForecast);
        Assert.False(d.State.DeteriorationForecast);
    }

    [Fact]
    public void ReleaseWithoutAManualSetting_IsRefused()
    {
        var d = new EngineDriver(Profile());
        var events = d.Run(0, new ReleaseForecast("dm (invented)", "why (invented)"));
        Assert.Equal("no manual forecast setting to release", Assert.Single(events.OfType<CommandRefused>()).Reason);
    }

    [Fact]
    public void TrendOfAMetar_SetsTheFlagForItsTwoHours()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Trend(0, "METAR XDMO 010300Z 24005KT 4000 BR SCT030 08/07 Q1020 TEMPO FM0330 0400 FG"));
        Assert.True(d.State.DeteriorationForecast);
        Assert.Equal(ForecastOrigin.Trend, d.State.ForecastSource!.Origin);
        d.Run(3 * Hour);
        Assert.False(d.State.DeteriorationForecast);
        Assert.Equal(EngineDriver.At(2 * Hour), d.Events.OfType<ForecastFlagChanged>().Last().At);
    }

    [Theory]
    [InlineData("taf", "METAR XDMO 010300Z 24005KT 9999 SCT030 08/05 Q1020", "TAF not decoded")]
    [InlineData("taf", "TAF XDMO 010250Z NIL", "NIL TAF")]
    [InlineData("taf", "TAF XOTH 010250Z 0103/0203 0300 FG", "not for this aerodrome XDMO")]
    [InlineData("trend", "METAR XDMO 010300Z 24005KT 9999 SCT030 08/05 Q1020", "no TREND")]
    [InlineData("trend", "not a report", "METAR not decoded")]
    public void BadForecasts_AreRejectedWithAReason_AndChangeNothing(string origin, string text, string reason)
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Taf(0, TempoFog));
        var before = d.State;
        var events = d.Run(0, new ForecastInput(origin == "taf" ? ForecastOrigin.Taf : ForecastOrigin.Trend, text, EngineDriver.At(0)));
        Assert.Contains(reason, Assert.Single(events.OfType<ForecastRejected>()).Reason, StringComparison.Ordinal);
        Assert.Equal(before.Forecasts, d.State.Forecasts);
        Assert.True(d.State.DeteriorationForecast);
    }

    [Fact]
    public void SameReportAgain_IsNotNew()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Taf(0, TempoFog));
        var again = d.Run(300, Taf(300, TempoFog));
        Assert.Empty(again.OfType<ForecastReceived>());
        Assert.Single(d.State.Forecasts);
    }

    [Fact]
    public void WithoutAForecastSection_ForecastsAreRecordedButTheFlagIsTheDutyManagersAlone()
    {
        var d = new EngineDriver(TestProfiles.Standard());
        var events = d.Run(0, Taf(0, TempoFog));
        Assert.Single(events.OfType<ForecastReceived>());
        Assert.False(d.State.DeteriorationForecast);
        d.Run(60, new SetForecast("dm (invented)", true, "judgement (invented)"));
        d.Run(120, Trend(120, "METAR XDMO 010302Z 24005KT 9999 SCT030 08/05 Q1020 NOSIG"));
        Assert.True(d.State.DeteriorationForecast); // no automatic flag to return to
        d.Run(180, new ReleaseForecast("dm (invented)", "judgement (invented)"));
        Assert.False(d.State.DeteriorationForecast);
    }

    [Fact]
    public void NewestForecastSpeaks_ANewerTafIssuedForLaterDoesNotSilenceTheCurrentOne()
    {
        var d = new EngineDriver(Profile());
        d.Run(0, Taf(0, TempoFog));
        // the next routine TAF, valid from 0900: the 0250Z TAF still speaks for 0500–0800
        d.Run(60, Taf(60, "TAF XDMO 010300Z 0109/0209 24005KT 9999 SCT030"));
        Assert.True(d.State.DeteriorationForecast);
        Assert.Equal(2, d.State.Forecasts.Count);
    }
}
