using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Tests.Profile;

namespace OpsLvp.Core.Tests.Engine.Replay;

/// <summary>
/// The invented demo night (seed-demo) with its invented forecasts (scenarios/demo-night.forecasts.csv, docs/engine.md
/// R25–R28): the routine TAF forecasts mist only, the 2025Z amendment forecasts TEMPO fog from 2100 and starts
/// preparation before the observed RVR falls below the (illustrative) 1000 m; the flag drops at the end of the TEMPO
/// window, so the end of the night is as without forecasts (seed-demo/README.md).
/// </summary>
public class DemoNightForecastTests
{
    private static readonly string Seed = Path.Combine(ProfileFixtures.RepoRoot(), "seed-demo");

    /// <summary>The demo night replayed with its actions, and with its forecasts when <paramref name="withForecasts"/>.</summary>
    internal static ReplayResult Replay(bool withForecasts)
    {
        var readings = Path.Combine(Seed, "scenarios", "demo-night.csv");
        var actions = Path.Combine(Seed, "scenarios", "demo-night.actions.csv");
        var forecasts = Path.Combine(Seed, "scenarios", "demo-night.forecasts.csv");
        return ReplayRunner.Run(
            ProfileValidator.LoadValidated(Path.Combine(Seed, "profile.json")),
            ReadingsCsv.Parse(File.ReadAllText(readings), readings),
            ActionsCsv.Parse(File.ReadAllText(actions), actions),
            withForecasts ? ForecastsCsv.Parse(File.ReadAllText(forecasts), forecasts) : []);
    }

    private static List<string> Transitions(ReplayResult r) =>
        r.Events.OfType<PhaseTransition>().Select(t => $"{t.At.UtcDateTime:HH:mm:ss} {t.From}->{t.To}").ToList();

    [Fact]
    public void AmendedTaf_StartsPreparationBeforeTheObservedRvrFalls()
    {
        var without = Replay(withForecasts: false);
        var with = Replay(withForecasts: true);
        Assert.Equal("20:37:06 Normal->Preparation", Transitions(without)[0]);
        // the amendment arrives at 20:30:00; the demo profile's preparation dwell is 60 s (illustrative)
        Assert.Equal(["20:31:00 Normal->Preparation", "21:42:06 Preparation->Active", "00:44:00 Active->Cancellation", "01:25:00 Cancellation->Normal"], Transitions(with));
        Assert.Equal(Transitions(without).Skip(1), Transitions(with).Skip(1));
        var flag = with.Events.OfType<ForecastFlagChanged>().Select(f => $"{f.At.UtcDateTime:HH:mm:ss} {(f.On ? "on" : "off")} {f.Source}").ToList();
        Assert.Equal(["20:30:00 on TAF 2100–0000 TEMPO 0400 FG VV002", "00:00:00 off "], flag);
        Assert.Equal(2, with.Events.OfType<ForecastReceived>().Count());
        Assert.Empty(with.Events.OfType<ForecastRejected>());
    }
}
