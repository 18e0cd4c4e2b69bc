using CsCheck;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R40: a command previewed on a copy of the state says what the engine would do, and its words.
/// Values are the invented test profile's (TestProfiles: active recovers at RVR 650 m and ceiling 250 ft,
/// entry dwells 30 s), illustrative only.
/// </summary>
public class CommandPreviewTests
{
    private const string Dm = "duty manager (invented)";

    [Fact]
    public void CancelWhileTheConditionsStillCallForActive_IsAgainstConditions_AndAsksASecondTime()
    {
        var d = new EngineDriver();
        d.WeatherFromTo(0, 60, 500);
        Assert.Equal(Phase.Active, d.State.Phase);
        var state = d.State;

        var p = d.Engine.Preview(state, new CancelLvp(Dm, "judgement (invented)"), EngineDriver.At(70));

        Assert.Same(state, d.State);
        Assert.Equal(Phase.Active, d.State.Phase);
        Assert.Null(p.Refusal);
        Assert.True(p.AgainstConditions);
        Assert.Equal((Phase.Active, Phase.Cancellation), (p.Before.Phase, p.After.Phase));
        Assert.Equal((650.0, 250.0), (p.RecoveryRvrM, p.RecoveryCeilingFt));
        Assert.Equal("This will move the state to Cancelling LVP now (from LVP in force).", CommandPreviewWords.Effect(p));
        Assert.Equal("Conditions still call for LVP in force.", CommandPreviewWords.CancelVerdict(p));
        var ask = CommandPreviewWords.SecondAsk(p);
        Assert.NotNull(ask);
        Assert.StartsWith("The conditions still call for LVP in force: the recovery condition does not hold.", ask, StringComparison.Ordinal);
        var facts = CommandPreviewWords.ConditionFacts(p).ToDictionary(f => f.Label, f => f.Value);
        Assert.Equal("500 m", facts["RVR 07 TDZ"]);
        Assert.Equal("500 m", facts["RVR 07 MID"]);
        Assert.Equal("500 m", facts["RVR 07 END"]);
        Assert.Equal("5000 ft", facts["Ceiling"]);
        Assert.Equal("650 m or more", facts["LVP in force recovers at RVR"]);
        Assert.Equal("250 ft or more", facts["LVP in force recovers at ceiling"]);
    }

    [Fact]
    public void CancelOnceRecoveryHolds_IsNotAgainstConditions_AndAsksOnce()
    {
        var d = new EngineDriver();
        d.WeatherFromTo(0, 60, 500);
        // 700 m >= 650 m: recovery from active holds, its 600 s dwell has not run yet, so the phase stays active
        d.WeatherFromTo(120, 180, 700);
        Assert.Equal(Phase.Active, d.State.Phase);

        var p = d.Engine.Preview(d.State, new CancelLvp(Dm, "judgement (invented)"), EngineDriver.At(190));

        Assert.False(p.AgainstConditions);
        Assert.Null(CommandPreviewWords.SecondAsk(p));
        Assert.Equal("The conditions support cancelling: the recovery condition holds.", CommandPreviewWords.CancelVerdict(p));
    }

    [Fact]
    public void CancelInNormal_SaysTheEnginesRefusal()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        var p = d.Engine.Preview(d.State, new CancelLvp(Dm, "judgement (invented)"), EngineDriver.At(10));
        Assert.Equal("nothing to cancel: the phase is normal", p.Refusal);
        Assert.Equal("The engine would refuse this now: nothing to cancel: the phase is normal.", CommandPreviewWords.Effect(p));
    }

    [Fact]
    public void SetForecastInNormal_SaysItStartsPreparationOnceTheEntryDwellHasRun()
    {
        // docs/engine.md R4: the forecast flag is a preparation condition; the test profile's entry dwell is 30 s (invented)
        var d = new EngineDriver();
        d.Weather(0, 1500);
        var p = d.Engine.Preview(d.State, new SetForecast(Dm, true, "fog forecast (invented)"), EngineDriver.At(10));
        Assert.Equal("This will move the state to LVP preparation within 30 s if the conditions hold (from Normal operations).", CommandPreviewWords.Effect(p));
    }

    [Fact]
    public void SetForecastWithoutEntryDwell_SaysItStartsPreparationNow()
    {
        var profile = TestProfiles.Standard();
        profile = profile with
        {
            Thresholds = profile.Thresholds with { Preparation = profile.Thresholds.Preparation with { EnterDwellSeconds = 0 } },
        };
        var d = new EngineDriver(profile);
        d.Weather(0, 1500);
        var p = d.Engine.Preview(d.State, new SetForecast(Dm, true, "fog forecast (invented)"), EngineDriver.At(10));
        Assert.Equal("This will move the state to LVP preparation now (from Normal operations).", CommandPreviewWords.Effect(p));
    }

    [Fact]
    public void ClearForecastBeforeItsDwellRan_SaysItKeepsNormal()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        d.Run(5, new SetForecast(Dm, true, "fog forecast (invented)"));
        var p = d.Engine.Preview(d.State, new SetForecast(Dm, false, "forecast withdrawn (invented)"), EngineDriver.At(10));
        Assert.Equal("This keeps Normal operations: without it the state would move to LVP preparation within 30 s.", CommandPreviewWords.Effect(p));
    }

    [Fact]
    public void SetSensorOutOfService_InGoodWeather_DoesNotChangeTheState()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        var p = d.Engine.Preview(d.State, new SetSensorService(Dm, "RVR25T", false, "fault (invented)"), EngineDriver.At(10));
        Assert.Equal("This does not change the state: it stays Normal operations.", CommandPreviewWords.Effect(p));
    }

    [Fact]
    public void Property_PreviewSaysWhatTheCommandDoes_AndLeavesTheStateAlone()
    {
        // over random invented weather and commands: the preview's phase after is the phase the same command gives
        // when evaluated for real, and the state passed in is not changed
        EngineCommand[] commands =
        [
            new CancelLvp(Dm, "judgement (invented)"),
            new SetForecast(Dm, true, "forecast (invented)"),
            new SetForecast(Dm, false, "forecast cleared (invented)"),
            new DeclarePhase(Dm, Phase.Preparation, "judgement (invented)"),
            new DeclarePhase(Dm, Phase.Active, "judgement (invented)"),
            new ReleaseHold(Dm, "judgement (invented)"),
        ];
        Gen.Select(Gen.Int[0, 6].Array[1, 8], Gen.OneOf(300.0, 500.0, 600.0, 700.0, 1050.0, 1500.0).Array[1, 8], Gen.Int[0, commands.Length - 1])
            .Sample((script, weather, pick) =>
            {
                var d = new EngineDriver();
                var t = 0;
                for (var i = 0; i < script.Length; i++)
                {
                    t += 20;
                    d.Weather(t, weather[i % weather.Length]);
                    if (script[i] < commands.Length)
                    {
                        d.Run(t, commands[script[i]]);
                    }
                }
                var before = d.State;
                var command = commands[pick];
                var at = EngineDriver.At(t + 5);
                var preview = d.Engine.Preview(before, command, at);
                var real = d.Engine.Evaluate(d.Engine.Evaluate(before, [], at).State, [command], at);
                Assert.Equal(real.State.Phase, preview.After.Phase);
                Assert.Equal(real.Events.OfType<CommandRefused>().SingleOrDefault()?.Reason, preview.Refusal);
                Assert.Same(before, d.State);
            }, iter: 100);
    }
}
