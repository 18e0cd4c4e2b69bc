using OpsLvp.Core.Engine;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Presentation;
using OpsLvp.Core.Tests.Engine;

namespace OpsLvp.Core.Tests.Presentation;

/// <summary>
/// <see cref="ForecastWords"/> over statuses the engine gives (docs/engine.md R29). TAFs and METARs invented for the
/// invented XDMO; settings invented and illustrative (<see cref="ForecastEngineTests.Settings"/>). T0 is 1 Dec 0300Z.
/// </summary>
public sealed class ForecastWordsTests
{
    [Fact]
    public void ForecastThatSetsTheFlag_IsShownInShortForm_WithWhenItsWindowBegins()
    {
        var d = new EngineDriver(ForecastEngineTests.Profile());
        d.Run(0, new ForecastInput(ForecastOrigin.Taf, "TAF XDMO 010250Z 0103/0203 24005KT 9999 SCT030 TEMPO 0105/0109 0300 FG VV002", EngineDriver.At(0)));
        var status = d.Engine.Describe(d.State, EngineDriver.At(0));
        Assert.Equal("FORECAST ON", ForecastWords.Headline(status));
        Assert.Equal("TAF 0500–0900 TEMPO 0300 FG VV002", ForecastWords.Source(status));
        Assert.Equal("window begins 05:00Z, in 2 h 00 min", ForecastWords.LookAhead(status, EngineDriver.At(0)));
        var later = d.Engine.Describe(d.State, EngineDriver.At(3 * 3600));
        Assert.Equal("window began 05:00Z, ends 09:00Z", ForecastWords.LookAhead(later, EngineDriver.At(3 * 3600)));
    }

    [Fact]
    public void ForecastBeyondTheHorizon_SaysWhenTheNextLookAheadBegins()
    {
        var d = new EngineDriver(ForecastEngineTests.Profile());
        d.Run(0, new ForecastInput(ForecastOrigin.Taf, "TAF XDMO 010250Z 0103/0203 24005KT 9999 SCT030 BECMG 0109/0111 0400 FG", EngineDriver.At(0)));
        var status = d.Engine.Describe(d.State, EngineDriver.At(0));
        Assert.Equal("FORECAST OFF", ForecastWords.Headline(status));
        Assert.Equal("no deterioration forecast within the look-ahead", ForecastWords.Source(status));
        Assert.Equal("next look-ahead from 06:00Z: TAF 0900–0300 BECMG 0400 FG", ForecastWords.LookAhead(status, EngineDriver.At(0)));
    }

    [Fact]
    public void ManualSetting_NamesThePersonAndReason()
    {
        var d = new EngineDriver(ForecastEngineTests.Profile());
        d.Run(0, new SetForecast("dm (invented)", true, "fog banks offshore (invented)"));
        var status = d.Engine.Describe(d.State, EngineDriver.At(0));
        Assert.Equal("FORECAST ON — SET BY HAND", ForecastWords.Headline(status));
        Assert.Equal("set by dm (invented) at 03:00Z: fog banks offshore (invented)", ForecastWords.Source(status));
        Assert.Null(ForecastWords.LookAhead(status, EngineDriver.At(0)));
    }

    [Fact]
    public void ProfileWithoutForecastSettings_SaysTheFlagIsTheDutyManagers()
    {
        var d = new EngineDriver(TestProfiles.Standard());
        var status = d.Engine.Describe(d.State, EngineDriver.At(0));
        Assert.Equal("FORECAST OFF", ForecastWords.Headline(status));
        Assert.Equal("set by the duty manager only (no forecast settings in the profile)", ForecastWords.Source(status));
    }
}
