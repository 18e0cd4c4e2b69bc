using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine.Replay;

/// <summary>
/// Replay scenarios with forecasts (docs/replay.md "Forecasts", docs/engine.md R25–R28): the same clear night of readings
/// (2000 m, 5000 ft everywhere: only a forecast can ask for preparation) with a TAF with TEMPO, BECMG or PROB30 fog under
/// different counted-group settings, an amended TAF that clears the flag, and an expired TAF. Files in Scenarios/, all
/// invented for the invented XDMO; thresholds and forecast settings illustrative. Group meanings: WMO-No. 306 FM 51
/// (from memory, docs/sources.md "Forecasts").
/// </summary>
public sealed class ForecastReplayTests
{
    private static AerodromeProfile Profile(bool tempo = true, bool prob30 = false) =>
        ProfileLoader.Load(ReplayScenarioTests.Scenario("xdmo-forecast-profile.json")) is var p
            ? p with { Forecast = p.Forecast! with { CountTempo = tempo, CountProb30 = prob30 } }
            : throw new InvalidOperationException();

    private static ReplayResult Replay(string name, AerodromeProfile profile)
    {
        var readings = ReplayScenarioTests.Scenario("forecast-clear-night.readings.csv");
        var forecasts = ReplayScenarioTests.Scenario($"{name}.forecasts.csv");
        return ReplayRunner.Run(profile, ReadingsCsv.Parse(File.ReadAllText(readings), readings), [],
            ForecastsCsv.Parse(File.ReadAllText(forecasts), forecasts));
    }

    private static List<string> Transitions(ReplayResult r) =>
        r.Events.OfType<PhaseTransition>().Select(t => $"{t.At.UtcDateTime:HH:mm:ss} {t.From}->{t.To}").ToList();

    private static List<string> Flag(ReplayResult r) =>
        r.Events.OfType<ForecastFlagChanged>().Select(f => $"{f.At.UtcDateTime:HH:mm:ss} {(f.On ? "on" : "off")}").ToList();

    [Fact]
    public void ProfileJson_ForecastSectionIsLoaded()
    {
        var p = ProfileLoader.Load(ReplayScenarioTests.Scenario("xdmo-forecast-profile.json"));
        Assert.Equal(180, p.Forecast!.HorizonMinutes);
        Assert.True(p.Forecast.CountTempo);
        Assert.False(p.Forecast.CountProb30);
    }

    [Theory]
    [InlineData("forecast-tempo", true, false, true)]
    [InlineData("forecast-tempo", false, false, false)]
    [InlineData("forecast-becmg", false, false, true)]
    [InlineData("forecast-becmg", true, false, true)]
    [InlineData("forecast-prob30", true, false, false)]
    [InlineData("forecast-prob30", true, true, true)]
    public void TempoBecmgProb30_StartPreparationAsTheSettingsSay(string scenario, bool tempo, bool prob30, bool prepares)
    {
        var r = Replay(scenario, Profile(tempo, prob30));
        if (prepares)
        {
            // the fog from 0400 is within the 3 h look-ahead as the TAF arrives at 0300; preparation after the 30 s dwell
            Assert.Equal(["03:00:00 on"], Flag(r));
            Assert.Equal("03:00:30 Normal->Preparation", Transitions(r)[0]);
        }
        else
        {
            Assert.Empty(Flag(r));
            Assert.Empty(Transitions(r));
        }
        Assert.Single(r.Events.OfType<ForecastReceived>());
    }

    [Fact]
    public void AmendedTaf_ClearsTheFlag_AndPreparationRecoversAfterItsDwell()
    {
        var r = Replay("forecast-amended", Profile());
        Assert.Equal(["03:00:00 on", "03:20:00 off"], Flag(r));
        // recovery from preparation: 900 s dwell from 03:20 (illustrative)
        Assert.Equal(["03:00:30 Normal->Preparation", "03:35:00 Preparation->Normal"], Transitions(r));
        var off = r.Events.OfType<ForecastFlagChanged>().Last();
        Assert.Null(off.Source);
        Assert.Contains("TAF XDMO 010318Z", off.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void ExpiredTaf_StopsCountingAtTheEndOfItsValidity_AndOneAlreadyExpiredIsRejected()
    {
        var r = Replay("forecast-expired", Profile());
        Assert.Equal(["03:00:00 on", "04:00:00 off"], Flag(r));
        Assert.Equal(["03:00:30 Normal->Preparation", "04:15:00 Preparation->Normal"], Transitions(r));
        var rejected = Assert.Single(r.Events.OfType<ForecastRejected>());
        Assert.Equal(new DateTimeOffset(2026, 12, 1, 3, 40, 0, TimeSpan.Zero), rejected.At);
        Assert.StartsWith("expired at", rejected.Reason, StringComparison.Ordinal);
        Assert.Empty(r.FinalState.Forecasts);
    }

    [Fact]
    public void ForecastsCsv_SyntaxErrorsNameFileAndLine()
    {
        var ex = Assert.Throws<FormatException>(() => ForecastsCsv.Parse("time,origin,text\n2026-12-01T03:00:00Z,speci,TAF XDMO\n", "f.csv"));
        Assert.Equal("f.csv line 2: origin must be taf or trend, not 'speci'", ex.Message);
        Assert.Throws<FormatException>(() => ForecastsCsv.Parse("time,kind,text\n", "f.csv"));
        Assert.Throws<FormatException>(() => ForecastsCsv.Parse("time,origin,text\n2026-12-01T03:00:00Z,taf,\n", "f.csv"));
    }

    [Fact]
    public void ReleaseForecastAction_IsParsedFromTheActionsCsv()
    {
        var actions = ActionsCsv.Parse("time,actor,action,target,value,reason\n2026-12-01T03:00:00Z,dm,release_forecast,,,back to forecasts\n", "a.csv");
        Assert.Equal(new ReleaseForecast("dm", "back to forecasts"), Assert.Single(actions).Command);
    }
}
