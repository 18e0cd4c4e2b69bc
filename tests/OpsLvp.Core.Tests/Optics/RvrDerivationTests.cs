using OpsLvp.Core.Optics;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Optics;

/// <summary>Raw sensor readings to RVR. Sensor ids, times and values are invented.</summary>
public sealed class RvrDerivationTests
{
    private static readonly DateTimeOffset T0 = new(2026, 1, 15, 4, 0, 0, TimeSpan.Zero);

    private static AerodromeProfile Profile() => new()
    {
        Version = "test",
        Aerodrome = new AerodromeInfo("XTST", "Test Field (invented)"),
        Runways = [new RunwayConfig("09/27", ["09", "27"])],
        Sensors =
        [
            new SensorConfig("fs1", SensorType.ForwardScatter, "09/27", new Dictionary<string, RvrPosition> { ["09"] = RvrPosition.Tdz }),
            new SensorConfig("tm1", SensorType.Transmissometer, "09/27", new Dictionary<string, RvrPosition> { ["09"] = RvrPosition.Mid }, BaselineM: 75),
            new SensorConfig("lum", SensorType.Luminance),
        ],
        Lights = new LightsConfig { IntensityCdByStep = new Dictionary<int, double> { [5] = 10_000 }, StepInUse = 5 },
        Thresholds = new ThresholdSet(new PhaseThresholds(), new PhaseThresholds()),
    };

    private static double Expected(double perKm, double luminance) =>
        RvrCalculator.Calculate(new RvrInputs
        {
            Extinction = ExtinctionCoefficient.FromPerKm(perKm),
            LightIntensity = new Candela(10_000),
            BackgroundLuminance = new CandelaPerSquareMetre(luminance),
        }).Report.Reported.Value;

    [Fact]
    public void Extinction_WithNightLuminance_GivesTheCalculatorsReportedRvr()
    {
        var d = new RvrDerivation(Profile());
        d.Observe(new Reading(T0, "lum", ReadingKind.BackgroundLuminance, 1.5));
        var derived = Assert.Single(d.Observe(new Reading(T0.AddSeconds(10), "fs1", ReadingKind.Extinction, 10)));
        Assert.Equal(ReadingKind.Rvr, derived.Kind);
        Assert.Equal("fs1", derived.SensorId);
        Assert.Equal(T0.AddSeconds(10), derived.Time);
        // σ = 10/km → MOR ≈ 300 m; with I = 10 000 cd at night the lights range ≈ 954 m (docs/sources.md worked check,
        // Annex 3 Att. D — from memory), reported rounded down on the 100 m step above 800 m: 900 m (ICAO Annex 3, App 3, §4.3.6)
        Assert.Equal(900, derived.Value);
        Assert.Equal(Expected(10, 1.5), derived.Value);
    }

    [Fact]
    public void NoFreshLuminance_UsesTheBrightDayThreshold_AndFlagsTheValueLuminanceUnknown()
    {
        // docs/engine.md R19. docs/sources.md check (Allard's law, Annex 3 Att. D bands — from memory): forward-scatter MOR
        // 300 m, 10 000 cd, luminance 20 000 cd/m² (bright day, 10⁻³ lx) gives report 0400; the normal-day band
        // (10⁻⁴ lx) the old fallback used gave 0550.
        var sigmaPerKm = -Math.Log(0.05) / 0.300;
        var d = new RvrDerivation(Profile());
        var derived = Assert.Single(d.Observe(new Reading(T0, "fs1", ReadingKind.Extinction, sigmaPerKm)));
        Assert.Equal(400, derived.Value);
        Assert.Equal(Expected(sigmaPerKm, 20_000), derived.Value);
        Assert.Equal(550, Expected(sigmaPerKm, 4_000));
        Assert.Equal(ReadingFlags.LuminanceUnknown, derived.Flags);
    }

    [Fact]
    public void NoFreshLuminance_WithTheContinuousThresholdOption_StillUsesTheBrightDayBand()
    {
        var profile = Profile() with { Lights = Profile().Lights with { ContinuousThreshold = true } };
        var sigmaPerKm = -Math.Log(0.05) / 0.300;
        var derived = Assert.Single(new RvrDerivation(profile).Observe(new Reading(T0, "fs1", ReadingKind.Extinction, sigmaPerKm)));
        // same docs/sources.md check as above: 0400
        Assert.Equal(400, derived.Value);
        Assert.Equal(ReadingFlags.LuminanceUnknown, derived.Flags);
    }

    [Fact]
    public void FreshLuminance_GivesAnUnflaggedValue_AndTheFlagLeavesWithTheLastUnknownSampleOfTheMinute()
    {
        var d = new RvrDerivation(Profile());
        Assert.Equal(ReadingFlags.LuminanceUnknown, Assert.Single(d.Observe(new Reading(T0, "fs1", ReadingKind.Extinction, 10))).Flags);
        d.Observe(new Reading(T0.AddSeconds(10), "lum", ReadingKind.BackgroundLuminance, 1.5));
        // the 1-minute mean still holds the sample assessed without luminance
        Assert.Equal(ReadingFlags.LuminanceUnknown, Assert.Single(d.Observe(new Reading(T0.AddSeconds(30), "fs1", ReadingKind.Extinction, 10))).Flags);
        d.Observe(new Reading(T0.AddSeconds(70), "lum", ReadingKind.BackgroundLuminance, 1.5));
        Assert.Equal(ReadingFlags.None, Assert.Single(d.Observe(new Reading(T0.AddSeconds(75), "fs1", ReadingKind.Extinction, 10))).Flags);
    }

    [Theory]
    [InlineData(1.0)]
    [InlineData(3.0)]
    [InlineData(10.0)]
    [InlineData(30.0)]
    [InlineData(100.0)]
    public void UnknownLuminanceFallback_IsNeverAboveTheRvrOfAnyBand(double sigmaPerKm)
    {
        // Allard's law: a higher E_T always shortens the lights range, so the fallback band bounds every band from below
        var fallback = RvrCalculator.Calculate(new RvrInputs { Extinction = ExtinctionCoefficient.FromPerKm(sigmaPerKm), LightIntensity = new(10_000) }.WithUnknownLuminance()).Rvr;
        foreach (var band in Enum.GetValues<LuminanceBand>())
        {
            var rvr = RvrCalculator.Calculate(new RvrInputs { Extinction = ExtinctionCoefficient.FromPerKm(sigmaPerKm), LightIntensity = new(10_000), Period = band }).Rvr;
            Assert.True(fallback <= rvr, $"σ {sigmaPerKm}/km: fallback {fallback} above {band} {rvr}");
        }
        Assert.Equal(LuminanceBand.BrightDay, IlluminanceThreshold.UnknownLuminanceBand);
    }

    // --- docs/engine.md R20: lights in use. Steps and intensities invented; step 0 = lights off gives RVR = MOR
    // (ICAO Annex 3, App 3, §4.3.5 — from memory); an unknown step takes the lowest intensity (common practice).

    private static AerodromeProfile WithLighting() => Profile() with
    {
        Sensors = [.. Profile().Sensors, new SensorConfig("agl", SensorType.Lighting)],
        Lights = new LightsConfig { IntensityCdByStep = new Dictionary<int, double> { [1] = 100, [3] = 1000, [5] = 10_000 }, StepInUse = 5 },
        MaxAgeSeconds = new Dictionary<ReadingKind, int> { [ReadingKind.LightStep] = 600 },
    };

    private static double ExpectedAt(double perKm, double luminance, double candela) =>
        RvrCalculator.Calculate(new RvrInputs
        {
            Extinction = ExtinctionCoefficient.FromPerKm(perKm),
            LightIntensity = new Candela(candela),
            BackgroundLuminance = new CandelaPerSquareMetre(luminance),
        }).Report.Reported.Value;

    [Fact]
    public void LightsOff_StepZero_GivesRvrEqualToMor()
    {
        var sigmaPerKm = -Math.Log(0.05) / 0.300; // MOR 300 m (WMO-No. 8: MOR = −ln 0.05 / σ)
        var d = new RvrDerivation(WithLighting());
        d.Observe(new Reading(T0, "lum", ReadingKind.BackgroundLuminance, 1.5));
        d.Observe(new Reading(T0, "agl", ReadingKind.LightStep, 0));
        var derived = Assert.Single(d.Observe(new Reading(T0.AddSeconds(5), "fs1", ReadingKind.Extinction, sigmaPerKm)));
        // MOR 300 m reported on the 25 m scale below 400 m: 0300 (ICAO Annex 3, App 3, §4.3.6 — from memory); with the
        // lights at step 5 (10 000 cd) at night the same air gives 0900 (docs/sources.md worked check)
        Assert.Equal(300, derived.Value);
        Assert.Equal(ReadingFlags.None, derived.Flags);
        Assert.Equal(900, ExpectedAt(sigmaPerKm, 1.5, 10_000));
    }

    [Fact]
    public void LightStepReading_SetsTheIntensityInUse()
    {
        var d = new RvrDerivation(WithLighting());
        d.Observe(new Reading(T0, "lum", ReadingKind.BackgroundLuminance, 1.5));
        Assert.Equal(ExpectedAt(10, 1.5, 10_000), Assert.Single(d.Observe(new Reading(T0.AddSeconds(1), "fs1", ReadingKind.Extinction, 10))).Value);
        d.Observe(new Reading(T0.AddSeconds(2), "agl", ReadingKind.LightStep, 3));
        Assert.Equal(new Candela(1000), d.IntensityAt(T0.AddSeconds(3), out var unknown));
        Assert.False(unknown);
        // a minute later, so the 1-minute mean holds only step-3 samples
        var derived = Assert.Single(d.Observe(new Reading(T0.AddSeconds(70), "fs1", ReadingKind.Extinction, 10)));
        Assert.Equal(ExpectedAt(10, 1.5, 1000), derived.Value);
        Assert.True(ExpectedAt(10, 1.5, 1000) < ExpectedAt(10, 1.5, 10_000));
    }

    [Theory]
    // a step the profile has no intensity for
    [InlineData(4.0)]
    // not a whole step
    [InlineData(2.5)]
    public void UnknownStep_UsesTheLowestIntensityAndFlagsIt(double step)
    {
        var d = new RvrDerivation(WithLighting());
        d.Observe(new Reading(T0, "lum", ReadingKind.BackgroundLuminance, 1.5));
        d.Observe(new Reading(T0, "agl", ReadingKind.LightStep, step));
        var derived = Assert.Single(d.Observe(new Reading(T0.AddSeconds(1), "fs1", ReadingKind.Extinction, 10)));
        Assert.Equal(ExpectedAt(10, 1.5, 100), derived.Value);
        Assert.Equal(ReadingFlags.LightStepUnknown, derived.Flags);
    }

    [Fact]
    public void StaleLightStep_IsUnknown_WhileTheStartingValueServesUntilTheFirstReading()
    {
        var d = new RvrDerivation(WithLighting());
        Assert.Equal(new Candela(10_000), d.IntensityAt(T0, out var beforeAny));
        Assert.False(beforeAny);
        d.Observe(new Reading(T0, "agl", ReadingKind.LightStep, 5));
        Assert.Equal(new Candela(10_000), d.IntensityAt(T0.AddSeconds(599), out var fresh));
        Assert.False(fresh);
        // light_step maximum age 600 s (invented): fresh until, exclusive, time + age (docs/engine.md R2)
        Assert.Equal(new Candela(100), d.IntensityAt(T0.AddSeconds(600), out var stale));
        Assert.True(stale);
    }

    [Fact]
    public void ManualStepZero_AtNight_GivesRvrEqualToMor_WithoutALightingSensor()
    {
        // docs/engine.md R20: a duty manager's step 0 (lights off) gives RVR = MOR (ICAO Annex 3 App 3 §4.3.5 — from memory)
        var sigmaPerKm = -Math.Log(0.05) / 0.300; // MOR 300 m (WMO-No. 8: MOR = −ln 0.05 / σ)
        var d = new RvrDerivation(Profile()) { ManualStep = new OpsLvp.Core.Engine.ManualLightStep(0, "dm (invented)", "lights failed (invented)", T0) };
        d.Observe(new Reading(T0, "lum", ReadingKind.BackgroundLuminance, 1.5));
        var derived = Assert.Single(d.Observe(new Reading(T0.AddSeconds(5), "fs1", ReadingKind.Extinction, sigmaPerKm)));
        // reported 0300 on the 25 m scale below 400 m (ICAO Annex 3, App 3, §4.3.6 — from memory); 0900 at 10 000 cd
        Assert.Equal(300, derived.Value);
        Assert.Equal(900, ExpectedAt(sigmaPerKm, 1.5, 10_000));
        Assert.Equal(new LightStepInUse(0, LightStepOrigin.Manual, "dm (invented)", T0, false), d.StepInUse(T0.AddSeconds(5)));
    }

    [Fact]
    public void ManualStep_IsUsedByTheDerivation_FromItsInstantOn()
    {
        var d = new RvrDerivation(WithLighting()) { ManualStep = new OpsLvp.Core.Engine.ManualLightStep(3, "dm (invented)", "r (invented)", T0.AddSeconds(60)) };
        d.Observe(new Reading(T0, "lum", ReadingKind.BackgroundLuminance, 1.5));
        // before the setting: the profile's starting step 5
        Assert.Equal(ExpectedAt(10, 1.5, 10_000), Assert.Single(d.Observe(new Reading(T0.AddSeconds(1), "fs1", ReadingKind.Extinction, 10))).Value);
        // a minute after the setting, so the mean holds only step-3 samples (luminance refreshed: 120 s maximum age)
        d.Observe(new Reading(T0.AddSeconds(120), "lum", ReadingKind.BackgroundLuminance, 1.5));
        var derived = Assert.Single(d.Observe(new Reading(T0.AddSeconds(125), "fs1", ReadingKind.Extinction, 10)));
        Assert.Equal(ExpectedAt(10, 1.5, 1000), derived.Value);
        Assert.NotEqual(ExpectedAt(10, 1.5, 10_000), derived.Value);
    }

    [Fact]
    public void ManualStep_AndLightingReadings_TheNewestWins_AndTheSettingDoesNotGoStale()
    {
        var d = new RvrDerivation(WithLighting());
        d.Observe(new Reading(T0, "agl", ReadingKind.LightStep, 1));
        d.ManualStep = new OpsLvp.Core.Engine.ManualLightStep(5, "dm (invented)", "r (invented)", T0.AddSeconds(10));
        // before the setting's instant the sensor's step stands
        Assert.Equal(new Candela(100), d.IntensityAt(T0.AddSeconds(5), out _));
        Assert.Equal(LightStepOrigin.Manual, d.StepInUse(T0.AddSeconds(20)).Origin);
        Assert.Equal(new Candela(10_000), d.IntensityAt(T0.AddSeconds(20), out var unknown));
        Assert.False(unknown);
        // past the light_step maximum age (600 s, invented) the sensor would be stale; the setting is not
        Assert.Equal(new Candela(10_000), d.IntensityAt(T0.AddSeconds(3600), out var later));
        Assert.False(later);
        // a newer lighting reading takes over again
        d.Observe(new Reading(T0.AddSeconds(30), "agl", ReadingKind.LightStep, 0));
        Assert.Equal(new LightStepInUse(0, LightStepOrigin.Sensor, "agl", T0.AddSeconds(30), false), d.StepInUse(T0.AddSeconds(40)));
        Assert.Equal(new Candela(0), d.IntensityAt(T0.AddSeconds(40), out _));
    }

    [Fact]
    public void Derived_IsTheOneMinuteMean_OfTheSensorsAssessedSamples()
    {
        var d = new RvrDerivation(Profile());
        d.Observe(new Reading(T0, "lum", ReadingKind.BackgroundLuminance, 1.5));
        d.Observe(new Reading(T0.AddSeconds(1), "fs1", ReadingKind.Extinction, 10));
        var second = Assert.Single(d.Observe(new Reading(T0.AddSeconds(31), "fs1", ReadingKind.Extinction, 5)));
        var a = RvrCalculator.Calculate(new RvrInputs { Extinction = ExtinctionCoefficient.FromPerKm(10), LightIntensity = new(10_000), BackgroundLuminance = new(1.5) }).Rvr;
        var b = RvrCalculator.Calculate(new RvrInputs { Extinction = ExtinctionCoefficient.FromPerKm(5), LightIntensity = new(10_000), BackgroundLuminance = new(1.5) }).Rvr;
        // 1-minute mean of unrounded values, rounded after (ICAO Annex 3, App 3, §4.3.5 — from memory)
        Assert.Equal(OpsLvp.Core.Reporting.RvrReporting.Report(new Metres((a.Value + b.Value) / 2)).Reported.Value, second.Value);
        // a sample a minute or more old has left the window
        var third = Assert.Single(d.Observe(new Reading(T0.AddSeconds(91), "fs1", ReadingKind.Extinction, 5)));
        Assert.Equal(OpsLvp.Core.Reporting.RvrReporting.Report(b).Reported.Value, third.Value);
    }

    [Fact]
    public void Transmittance_UsesTheSensorsBaseline()
    {
        var d = new RvrDerivation(Profile());
        d.Observe(new Reading(T0, "lum", ReadingKind.BackgroundLuminance, 1.5));
        // T = exp(−σ·b) with σ = 10/km, b = 75 m (WMO-No. 8): the same atmosphere as the forward-scatter case
        var derived = Assert.Single(d.Observe(new Reading(T0.AddSeconds(5), "tm1", ReadingKind.Transmittance, Math.Exp(-0.010 * 75))));
        Assert.Equal(900, derived.Value);
    }

    [Theory]
    [InlineData("fs1", ReadingKind.Extinction, 10, ReadingStatus.Failed)]
    [InlineData("fs1", ReadingKind.Extinction, -1, ReadingStatus.Ok)]
    [InlineData("fs1", ReadingKind.Transmittance, 0.5, ReadingStatus.Ok)]
    [InlineData("nope", ReadingKind.Extinction, 10, ReadingStatus.Ok)]
    [InlineData("tm1", ReadingKind.Transmittance, 1.0, ReadingStatus.Ok)]
    public void BadRawReadings_DeriveNothing(string sensor, ReadingKind kind, double value, ReadingStatus status)
    {
        var d = new RvrDerivation(Profile());
        Assert.Empty(d.Observe(new Reading(T0, sensor, kind, value, status)));
    }

    [Fact]
    public void OutOfOrderRawReading_DerivesNothing()
    {
        var d = new RvrDerivation(Profile());
        Assert.Single(d.Observe(new Reading(T0.AddSeconds(30), "fs1", ReadingKind.Extinction, 10)));
        Assert.Empty(d.Observe(new Reading(T0, "fs1", ReadingKind.Extinction, 10)));
    }
}
