using OpsLvp.Core.Engine;
using static OpsLvp.Core.Tests.Engine.EngineDriver;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md R3 and R5: unknown never satisfies recovery; a silent sensor blocks relaxation; unconfigured inputs are left out.</summary>
public class RecoveryFailSafeTests
{
    /// <summary>Good readings from RVR07T, RVR07M and CEIL1 only, every 60 s.</summary>
    private static void GoodExceptRvr25T(EngineDriver d, double from, double to)
    {
        for (var t = from; t <= to; t += 60)
        {
            d.Run(t, Rvr(t, "RVR07T", 1500), Rvr(t, "RVR07M", 1500), Ceiling(t, 5000));
        }
    }

    [Fact]
    public void SilentGoverningSensor_BlocksRelaxationEvenWhenOthersReadWell()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Weather(60, 1500);
        GoodExceptRvr25T(d, 120, 1500);
        Assert.Equal("30:Normal->Active", d.TransitionLog);
        Assert.Contains(d.State.Alarms, a => a.Key == "feed-silent:RVR25T");
    }

    [Fact]
    public void SilentSensorMarkedOutOfService_NoLongerBlocks_AndRecoveryDwellRunsFromThen()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Weather(60, 1500);
        GoodExceptRvr25T(d, 120, 180);
        // RVR25T's 60 s reading goes stale at 180 s: recovery stopped holding there
        d.Run(200, new SetSensorService("dm (invented)", "RVR25T", false, "sensor fault reported (invented)"));
        GoodExceptRvr25T(d, 240, 840);
        Assert.Equal("30:Normal->Active; 800:Active->Cancellation", d.TransitionLog);
        Assert.DoesNotContain(d.State.Alarms, a => a.Key == "feed-silent:RVR25T");
    }

    [Fact]
    public void StaleCeilometer_BlocksRelaxation()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        for (var t = 60.0; t <= 1500; t += 60)
        {
            d.Run(t, [.. TestProfiles.GoverningRvr.Select(s => Rvr(t, s, 1500))]);
        }
        Assert.Equal("30:Normal->Active", d.TransitionLog);
        Assert.Contains(d.State.Alarms, a => a.Kind == AlarmKind.CeilingUnknown);
    }

    [Fact]
    public void WithoutCeilometers_CeilingIsLeftOut_AndRecoveryRestsOnRvr()
    {
        var d = new EngineDriver(TestProfiles.WithoutCeilometer());
        d.Run(0, [.. TestProfiles.GoverningRvr.Select(s => Rvr(0, s, 500))]);
        for (var t = 60.0; t <= 700; t += 60)
        {
            d.Run(t, [.. TestProfiles.GoverningRvr.Select(s => Rvr(t, s, 700))]);
        }
        Assert.Equal("30:Normal->Active; 660:Active->Cancellation", d.TransitionLog);
        Assert.DoesNotContain(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Kind == AlarmKind.CeilingUnknown);
    }

    [Fact]
    public void EscalationUsesWhatIsKnown_WhenOtherSensorsAreSilent()
    {
        var d = new EngineDriver();
        d.Run(0, Rvr(0, "RVR07M", 500));
        d.Run(40);
        Assert.Equal("30:Normal->Active", d.TransitionLog);
    }

    [Fact]
    public void AllDataGoingStale_NeverRelaxesActive()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Run(5000);
        Assert.Equal("30:Normal->Active", d.TransitionLog);
        Assert.Contains(d.State.Alarms, a => a.Kind == AlarmKind.GoverningRvrUnknown);
    }
}
