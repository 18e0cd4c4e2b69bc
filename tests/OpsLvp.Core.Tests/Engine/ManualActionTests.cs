using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md R9: declarations set holds, cancel works against the conditions, escalation after a manual relaxation waits its dwell from the action.</summary>
public class ManualActionTests
{
    private const string Dm = "duty manager (invented)";

    [Fact]
    public void DeclareActive_EntersActiveAndHoldsAgainstRecovery()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        d.Run(10, new DeclarePhase(Dm, Phase.Active, "fog bank approaching (invented)"));
        d.WeatherFromTo(60, 1500, 1500);
        Assert.Equal("10:Normal->Active", d.TransitionLog);
        var t = d.Transitions.Single();
        Assert.Equal((TransitionBy.Manual, Dm), (t.By, t.Actor));
        Assert.Equal(Phase.Active, d.State.Hold?.Phase);
    }

    [Fact]
    public void ReleasingTheHold_LetsRelaxationFollowOnceItsDwellHasHeld()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        d.Run(10, new DeclarePhase(Dm, Phase.Active, "fog bank approaching (invented)"));
        d.WeatherFromTo(60, 720, 1500);
        d.Run(720, new ReleaseHold(Dm, "fog did not arrive (invented)"));
        Assert.Equal("10:Normal->Active; 720:Active->Cancellation", d.TransitionLog);
        Assert.Null(d.State.Hold);
    }

    [Fact]
    public void DeclarePreparation_BlocksAutomaticReturnToNormal()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Run(40, new DeclarePhase(Dm, Phase.Preparation, "keep safeguards (invented)"));
        d.WeatherFromTo(60, 2000, 1500);
        Assert.Equal("30:Normal->Preparation", d.TransitionLog);
    }

    [Fact]
    public void CancelPreparation_AgainstTheConditions_EscalatesAgainOnlyAfterTheDwellFromTheCancel()
    {
        var d = new EngineDriver();
        d.WeatherFromTo(0, 60, 800);
        d.Run(100, new CancelLvp(Dm, "judged local patch (invented)"));
        d.WeatherFromTo(120, 180, 800);
        Assert.Equal("30:Normal->Preparation; 100:Preparation->Normal; 130:Normal->Preparation", d.TransitionLog);
        Assert.Equal(TransitionBy.Manual, d.Transitions.ElementAt(1).By);
    }

    [Fact]
    public void CancelActive_EntersCancellation_AndReinstatementWaitsTheDwellFromTheCancel()
    {
        var d = new EngineDriver();
        d.WeatherFromTo(0, 60, 500);
        d.Run(90, new CancelLvp(Dm, "RVR sensor suspected (invented)"));
        d.WeatherFromTo(120, 180, 500);
        Assert.Equal("30:Normal->Active; 90:Active->Cancellation; 120:Cancellation->Active", d.TransitionLog);
    }

    [Theory]
    [InlineData("")]
    [InlineData("   ")]
    public void CommandsThatNeedAReason_AreRefusedWithBlankReason(string reason)
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        var events = d.Run(10,
            new DeclarePhase(Dm, Phase.Active, reason),
            new SetForecast(Dm, true, reason),
            new SetSensorService(Dm, "RVR07T", false, reason),
            new UntickItem(Dm, "P1", reason));
        Assert.Equal(4, events.OfType<CommandRefused>().Count());
        Assert.All(events.OfType<CommandRefused>(), r => Assert.Contains("reason", r.Reason));
        Assert.Equal(Phase.Normal, d.State.Phase);
        Assert.False(d.State.DeteriorationForecast);
    }

    [Fact]
    public void CancelInNormal_IsRefused()
    {
        var d = new EngineDriver();
        var refused = Assert.Single(d.Run(10, new CancelLvp(Dm, "test (invented)")).OfType<CommandRefused>());
        Assert.Equal("nothing to cancel: the phase is normal", refused.Reason);
    }

    [Fact]
    public void UnknownSensor_IsRefused()
    {
        var d = new EngineDriver();
        var refused = Assert.Single(d.Run(10, new SetSensorService(Dm, "NOPE", false, "test (invented)")).OfType<CommandRefused>());
        Assert.Equal("unknown sensor 'NOPE'", refused.Reason);
    }

    [Fact]
    public void ManualActions_AreRecorded()
    {
        var d = new EngineDriver();
        var events = d.Run(10, new SetForecast(Dm, true, "TAF (invented)"), new SetSensorService(Dm, "RVR07M", false, "maintenance (invented)"));
        Assert.Equal(["forecast", "sensor_out"], events.OfType<ManualActionApplied>().Select(m => m.Action));
        Assert.Contains("RVR07M", d.State.OutOfService);
    }

    private sealed record UnknownCommand(string Actor) : EngineCommand(Actor);

    [Fact]
    public void CommandsThatCannotApply_AreRefusedWithAReadableReason_NeverThrown()
    {
        var d = new EngineDriver();
        var events = d.Run(10,
            new DeclarePhase(Dm, Phase.Normal, "r"),
            new DeclarePhase(" ", Phase.Active, "r"),
            new ReleaseHold(Dm, "r"),
            new SetForecast(Dm, false, "r"),
            new ConfirmPending(Dm),
            new UnknownCommand(Dm));
        Assert.Equal(
        [
            "only LVP preparation or LVP in force can be declared, not Normal operations",
            "actor is blank",
            "no hold to release",
            "deterioration forecast is already off",
            "nothing to confirm: no transition is pending",
            "unknown command UnknownCommand",
        ], events.OfType<CommandRefused>().Select(r => r.Reason));
        Assert.Equal(Phase.Normal, d.State.Phase);
    }

    [Fact]
    public void EvaluatingAtAnEarlierInstant_IsTreatedAsTheStatesInstant()
    {
        var d = new EngineDriver();
        d.Run(100);
        var result = d.Engine.Evaluate(d.State, [EngineDriver.Rvr(100, "RVR07T", 800)], EngineDriver.At(50));
        Assert.Equal(EngineDriver.At(100), result.State.EvaluatedAt);
        Assert.All(result.Events, e => Assert.Equal(EngineDriver.At(100), e.At));
    }
}
