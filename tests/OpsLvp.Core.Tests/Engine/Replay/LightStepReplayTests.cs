using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Engine.Replay;

/// <summary>
/// docs/engine.md R20 through the replay (the same <c>RvrDerivation</c> the live host uses): a lighting sensor's
/// <c>light_step</c> decides the intensity of the derived RVR. Profile, sensors and readings invented; forward-scatter
/// MOR 300 m at night with 10 000 cd gives 0900, with the lights off 0300 (docs/sources.md "Optics" worked check; step 0 =
/// object range alone, ICAO Annex 3 App 3 §4.3.5 — from memory).
/// </summary>
public sealed class LightStepReplayTests
{
    private static readonly DateTimeOffset T0 = TestProfiles.T0;

    private static AerodromeProfile Profile() => TestProfiles.Standard() with
    {
        Sensors = [.. TestProfiles.Standard().Sensors, new SensorConfig("AGL", SensorType.Lighting), new SensorConfig("LUM", SensorType.Luminance)],
        Lights = new LightsConfig { IntensityCdByStep = new Dictionary<int, double> { [1] = 100, [5] = 10_000 }, StepInUse = 5 },
    };

    private static List<Reading> Night(double step)
    {
        var sigmaPerKm = -Math.Log(0.05) / 0.300; // MOR 300 m (WMO-No. 8)
        return
        [
            new Reading(T0, "LUM", ReadingKind.BackgroundLuminance, 1),
            new Reading(T0, "AGL", ReadingKind.LightStep, step),
            new Reading(T0, "RVR07T", ReadingKind.Rvr, 1500),
            new Reading(T0, "RVR07M", ReadingKind.Rvr, 1500),
            new Reading(T0, "CEIL1", ReadingKind.CloudBase, 5000),
            new Reading(T0.AddSeconds(1), "RVR25T", ReadingKind.Extinction, sigmaPerKm),
        ];
    }

    [Fact]
    public void Step5_GivesTheLightsRange_AndOnlyPreparation()
    {
        var result = ReplayRunner.Run(Profile(), Night(5), [], T0.AddSeconds(60));
        Assert.Equal(900, result.FinalState.Latest[EngineState.SensorKey("RVR25T", ReadingKind.Rvr)].Value);
        var t = Assert.Single(result.Events.OfType<PhaseTransition>());
        Assert.Equal((Phase.Normal, Phase.Preparation), (t.From, t.To));
        Assert.Equal("RVR 07 END 900 m < 1000 m", t.Reason);
    }

    [Fact]
    public void LightsOff_GivesRvrEqualToMor_AndEscalatesOnIt()
    {
        var result = ReplayRunner.Run(Profile(), Night(0), [], T0.AddSeconds(60));
        Assert.Equal(300, result.FinalState.Latest[EngineState.SensorKey("RVR25T", ReadingKind.Rvr)].Value);
        // the first transition leaves normal on 300 m, whichever phase the safeguards rule lets it reach first
        var t = result.Events.OfType<PhaseTransition>().First();
        Assert.Equal(Phase.Normal, t.From);
        Assert.StartsWith("RVR 07 END 300 m <", t.Reason, StringComparison.Ordinal);
    }

    private static List<Reading> NightWithoutLightingSensor()
    {
        var sigmaPerKm = -Math.Log(0.05) / 0.300; // MOR 300 m (WMO-No. 8)
        return
        [
            new Reading(T0, "LUM", ReadingKind.BackgroundLuminance, 1),
            new Reading(T0, "RVR07T", ReadingKind.Rvr, 1500),
            new Reading(T0, "RVR07M", ReadingKind.Rvr, 1500),
            new Reading(T0, "CEIL1", ReadingKind.CloudBase, 5000),
            new Reading(T0.AddSeconds(1), "RVR25T", ReadingKind.Extinction, sigmaPerKm),
            new Reading(T0.AddSeconds(70), "RVR25T", ReadingKind.Extinction, sigmaPerKm),
        ];
    }

    [Fact]
    public void LightStepAction_SetsTheStepTheDerivationUses_AsLiveWould()
    {
        var profile = TestProfiles.Standard() with
        {
            Sensors = [.. TestProfiles.Standard().Sensors, new SensorConfig("LUM", SensorType.Luminance)],
            Lights = new LightsConfig { IntensityCdByStep = new Dictionary<int, double> { [1] = 100, [5] = 10_000 }, StepInUse = 5 },
        };
        var key = EngineState.SensorKey("RVR25T", ReadingKind.Rvr);
        // without the action: step 5 (10 000 cd) at night, 0900 (docs/sources.md "Optics" worked check)
        Assert.Equal(900, ReplayRunner.Run(profile, NightWithoutLightingSensor(), [], T0.AddSeconds(90)).FinalState.Latest[key].Value);

        var actions = ActionsCsv.Parse(ActionsCsv.Header + "\n"
            + $"{T0.AddSeconds(5):yyyy-MM-ddTHH:mm:ssZ},Lin (invented),light_step,,0,runway lights failed (invented)\n", "a.csv");
        var result = ReplayRunner.Run(profile, NightWithoutLightingSensor(), actions, T0.AddSeconds(90));
        // the sample at +70 s is the only one in its 1-minute mean and was assessed with the lights off: RVR = MOR, 0300
        Assert.Equal(300, result.FinalState.Latest[key].Value);
        Assert.Equal(0, result.FinalState.ManualLightStep?.Step);
        var applied = Assert.Single(result.Events.OfType<ManualActionApplied>());
        Assert.Equal(("light_step", "Lin (invented)"), (applied.Action, applied.Actor));
    }
}
