using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R14 and R15: the screen is never calmer than the conditions. Values are the invented test
/// profile's (TestProfiles); the 325 m / 150 ft case is the one named in issue 11 (invented values).
/// </summary>
public class CalmerScreenTests
{
    private const string Dm = "duty manager (invented)";

    [Fact]
    public void NormalToActivePendingConfirmation_StillEntersPreparation()
    {
        // only normal -> active needs confirmation (the engine-level rule; the validator asks for preparation -> active too)
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Normal, Phase.Active)));
        d.WeatherFromTo(0, 120, 325, ceilingFt: 150);
        var first = d.Transitions.First();
        Assert.Equal((EngineDriver.At(30), Phase.Normal, Phase.Preparation, TransitionBy.Auto), (first.At, first.From, first.To, first.By));
        Assert.NotEqual(Phase.Normal, d.State.Phase);
    }

    [Fact]
    public void BothEntriesToActiveConfirmed_PreparationIsEnteredAndActiveProposed()
    {
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Normal, Phase.Active), new TransitionRule(Phase.Preparation, Phase.Active)));
        d.WeatherFromTo(0, 120, 325, ceilingFt: 150);
        Assert.Equal("30:Normal->Preparation", d.TransitionLog);
        Assert.Equal((Phase.Preparation, Phase.Active), (d.State.Pending?.From, d.State.Pending?.To));
    }

    [Fact]
    public void ValidatorAsksToConfirmPreparationToActive_WhenNormalToActiveIsConfirmed()
    {
        var problems = ProfileValidator.Validate(TestProfiles.Confirming(new TransitionRule(Phase.Normal, Phase.Active)) with { Version = "v" });
        Assert.Contains(problems.Problems, p => p.Field == "confirm[0]" && p.Message.Contains("preparation → active does not", StringComparison.Ordinal));
    }

    [Fact]
    public void CancelAgainstTheConditions_IsRecordedUntilRecoveryHolds()
    {
        var d = new EngineDriver();
        d.WeatherFromTo(0, 60, 500);
        Assert.Equal(Phase.Active, d.State.Phase);
        d.Run(70, new CancelLvp(Dm, "tower reports improving (invented)"));
        var relaxed = d.State.RelaxedAgainstConditions;
        Assert.Equal((Dm, Phase.Active, Phase.Cancellation, EngineDriver.At(70)), (relaxed?.Actor, relaxed?.From, relaxed?.To, relaxed?.At));
        var status = d.Engine.Describe(d.State, EngineDriver.At(71));
        Assert.Contains("relaxed by duty manager (invented) against conditions", StatusNotes.For(status).Single(), StringComparison.Ordinal);
        // 600 m is in the hysteresis band (550..650, invented): the conditions do not agree yet
        d.Weather(80, 600);
        Assert.NotNull(d.State.RelaxedAgainstConditions);
        // 700 m >= 650 m: recovery from active holds, the record ends
        d.Weather(90, 700);
        Assert.Null(d.State.RelaxedAgainstConditions);
    }

    [Fact]
    public void CancelWhenRecoveryAlreadyHolds_IsNotAgainstTheConditions()
    {
        var d = new EngineDriver();
        d.WeatherFromTo(0, 60, 500);
        d.Weather(70, 700);
        d.Run(80, new CancelLvp(Dm, "measures no longer needed (invented)"));
        Assert.Equal(Phase.Cancellation, d.State.Phase);
        Assert.Null(d.State.RelaxedAgainstConditions);
    }
}
