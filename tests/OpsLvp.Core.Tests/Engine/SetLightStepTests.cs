using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md R20: the duty manager sets the runway-light step by hand, with a reason, audited. People and reasons invented.</summary>
public sealed class SetLightStepTests
{
    private const string Dm = "duty manager (invented)";

    private static AerodromeProfile Profile() => TestProfiles.Standard() with
    {
        Lights = new LightsConfig { IntensityCdByStep = new Dictionary<int, double> { [1] = 100, [5] = 10_000 }, StepInUse = 5 },
    };

    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    [InlineData(5)]
    public void ConfiguredStepOrZero_IsSet_RecordedInTheState_AndAudited(int step)
    {
        var engine = new LvpEngine(Profile());
        var at = TestProfiles.T0.AddSeconds(10);
        var result = engine.Evaluate(engine.Initial(TestProfiles.T0), [new SetLightStep(Dm, step, "lights checked (invented)")], at);
        Assert.Equal(new ManualLightStep(step, Dm, "lights checked (invented)", at), result.State.ManualLightStep);
        var applied = Assert.Single(result.Events.OfType<ManualActionApplied>());
        Assert.Equal(("light_step", Dm, "lights checked (invented)"), (applied.Action, applied.Actor, applied.Reason));
        Assert.StartsWith($"light step {step}", applied.Detail, StringComparison.Ordinal);
        Assert.DoesNotContain(result.Events, e => e is CommandRefused);
    }

    [Theory]
    [InlineData(3, "ok (invented)", "light step 3 is not configured (steps: 0 (off), 1, 5)")]
    [InlineData(-1, "ok (invented)", "light step -1 is not configured (steps: 0 (off), 1, 5)")]
    [InlineData(5, "  ", "a reason is required to set the light step")]
    public void UnknownStep_OrNoReason_IsRefused_AndChangesNothing(int step, string reason, string why)
    {
        var engine = new LvpEngine(Profile());
        var initial = engine.Initial(TestProfiles.T0);
        var result = engine.Evaluate(initial, [new SetLightStep(Dm, step, reason)], TestProfiles.T0.AddSeconds(10));
        Assert.Equal(why, Assert.Single(result.Events.OfType<CommandRefused>()).Reason);
        Assert.Null(result.State.ManualLightStep);
        Assert.DoesNotContain(result.Events, e => e is ManualActionApplied);
        Assert.Equal(why, CommandPreconditions.Check(new SetLightStep(Dm, step, reason), Profile()));
    }
}
