using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using static OpsLvp.Core.Tests.Engine.EngineDriver;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>LvpEngine.Describe: what displays show and what the engine waits for.</summary>
public class StatusTests
{
    [Fact]
    public void Describe_ShowsGoverningRvrAndPerPositionValuesForTheDirectionInUse()
    {
        var d = new EngineDriver();
        d.Run(0, Rvr(0, "RVR07T", 900), Rvr(0, "RVR07M", 800), Rvr(0, "RVR25T", 1200), Ceiling(0, 400));
        var s = d.Engine.Describe(d.State, At(20));
        Assert.Equal((800, "RVR07M", "07 MID", 20d, false), (s.GoverningRvr!.Value, s.GoverningRvr.SensorId, s.GoverningRvr.Label, s.GoverningRvr.AgeSeconds, s.GoverningRvr.Stale));
        Assert.Equal(400, s.Ceiling!.Value);
        var runway = Assert.Single(s.Runways);
        Assert.Equal("07", runway.Direction);
        Assert.Equal([RvrPosition.Tdz, RvrPosition.Mid, RvrPosition.End], runway.Positions.Select(p => p.Position));
        Assert.Equal(["RVR07T", "RVR07M", "RVR25T"], runway.Positions.Select(p => p.SensorId));
        Assert.True(d.Engine.Describe(d.State, At(130)).Runways[0].Positions[0].Reading!.Stale);
    }

    [Fact]
    public void Describe_InNormal_TellsHowLongThePreparationConditionHasHeld()
    {
        var d = new EngineDriver();
        d.Weather(0, 800, ceilingFt: 5000);
        var s = d.Engine.Describe(d.State, At(20));
        Assert.Contains(s.Waiting, w => w.Text == "preparation condition held 20 of 30 s" && w.Kind == WaitKind.EscalationDwell);
    }

    [Fact]
    public void Describe_InActive_TellsRecoveryProgressAndWhatBlocksIt()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.WeatherFromTo(60, 420, 700);
        var s = d.Engine.Describe(d.State, At(420));
        Assert.Contains(s.Waiting, w => w.Text == "recovery from active held 6 of 10 min" && w.HeldSeconds == 360 && w.RequiredSeconds == 600);
        d.Run(440, Rvr(440, "RVR07T", 700), Rvr(440, "RVR07M", 700), Ceiling(440, 5000));
        d.Run(545);
        var blocked = d.Engine.Describe(d.State, At(545));
        Assert.Contains(blocked.Waiting, w => w.Text == "recovery blocked: no fresh reading from RVR25T");
    }

    [Fact]
    public void Describe_InCancellation_CountsOpenMandatoryItems()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.WeatherFromTo(60, 660, 700);
        var s = d.Engine.Describe(d.State, At(660));
        Assert.Contains(s.Waiting, w => w.Text == "cancellation: 1 mandatory item open" && w.Subjects.SequenceEqual(["C1"]));
    }

    [Fact]
    public void Describe_WithPending_SaysItWaitsForConfirmation()
    {
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Normal, Phase.Preparation)));
        d.Weather(0, 800);
        d.Run(40);
        Assert.Contains(d.Engine.Describe(d.State, At(40)).Waiting, w => w.Kind == WaitKind.Confirmation && w.Text.StartsWith("waiting for confirmation", StringComparison.Ordinal));
    }

    [Fact]
    public void Describe_WithoutCeilometers_SaysCeilingIsNotConfigured_AndShowsThresholdsInEffect()
    {
        var profile = TestProfiles.WithoutCeilometer();
        var d = new EngineDriver(profile);
        d.Run(0, Rvr(0, "RVR07T", 700));
        var s = d.Engine.Describe(d.State, At(10));
        Assert.False(s.CeilingConfigured);
        Assert.Null(s.Ceiling);
        Assert.Equal(profile.Thresholds, s.Thresholds);
        Assert.Equal(Phase.Normal, s.Phase);
    }
}
