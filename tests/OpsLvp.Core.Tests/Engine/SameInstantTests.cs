using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R17: the state at τ includes every input timed at or before τ. RVR maximum age 120 s and the
/// dwells are the invented test profile's (TestProfiles).
/// </summary>
public class SameInstantTests
{
    [Fact]
    public void NextReadingArrivingWhenThePreviousGoesStale_LeavesTheSensorNeverSilent()
    {
        var d = new EngineDriver();
        d.Weather(0, 2000);
        d.Weather(60, 2000);
        // readings at 60 s go stale at 180 s (60 + 120); the next ones arrive exactly then
        d.Weather(180, 2000);
        d.Run(200);
        string[] watched = [.. TestProfiles.GoverningRvr.Select(AlarmKeys.SensorSilent), AlarmKeys.SensorSilent("CEIL1"), AlarmKeys.RvrUnknown];
        Assert.DoesNotContain(d.Events.OfType<AlarmRaised>(), a => watched.Contains(a.Alarm.Key));
    }

    [Fact]
    public void RecoveryDwell_IsNotRestarted_ByAReadingArrivingAtTheStaleInstant()
    {
        var d = new EngineDriver();
        d.WeatherFromTo(0, 60, 500);
        Assert.Equal(Phase.Active, d.State.Phase);
        // recovery from active (>= 650 m) from 100 s, readings every 120 s exactly at the stale instant of the last
        for (var t = 100; t <= 820; t += 120)
        {
            d.Weather(t, 800);
        }
        // 600 s recover dwell (invented) from 100 s: cancellation at 700 s, not later
        Assert.Equal(EngineDriver.At(700), d.Transitions.Single(x => x.To == Phase.Cancellation).At);
    }

    [Fact]
    public void DwellCompletingAtAnInputInstant_IsJudgedWithThatInput()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        // the preparation dwell (30 s) would complete at 30 s; the reading at 30 s says the condition no longer holds
        d.Weather(30, 1500);
        d.Run(60);
        Assert.Empty(d.Transitions);
    }
}
