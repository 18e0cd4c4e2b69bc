using OpsLvp.Core.Optics;
using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Optics;

public sealed class RvrCalculatorTests
{
    private static readonly Candela _intensity = new(10_000); // docs/sources.md Optics worked values use I = 10 000 cd

    [Theory]
    // Worked check values computed from the formulas above (docs/sources.md Optics), I = 10 000 cd;
    // bands — ICAO Annex 3, Attachment D (from memory); reporting — ICAO Annex 3, App 3, §4.3.6 (from memory)
    [InlineData(300, 1.0, 954, "0900")] // MOR 300 m, night
    [InlineData(300, 5000.0, 573, "0550")] // MOR 300 m, normal day
    [InlineData(600, 5000.0, 945, "0900")] // MOR 600 m, normal day
    public void Calculate_DomainWorkedValues_GiveTheReport(double mor, double luminance, double lightsMetres, string report)
    {
        var result = RvrCalculator.Calculate(new RvrInputs
        {
            Mor = new Metres(mor),
            LightIntensity = _intensity,
            BackgroundLuminance = new CandelaPerSquareMetre(luminance),
        });

        Assert.Equal(mor, result.Mor.Value);
        Assert.Equal(mor, result.ObjectRange.Value);
        Assert.Equal(lightsMetres, result.LightsRange.Value, 0.5);
        Assert.Equal(result.LightsRange, result.Rvr);
        Assert.Equal(report, result.Report.ToMetar());
    }

    [Fact]
    public void Calculate_MorThousandAtNight_ReportsP2000()
    {
        // MOR 1000 m at night → above 2000 m (P2000): computed from the formulas above (docs/sources.md Optics)
        var result = RvrCalculator.Calculate(new RvrInputs { Mor = new Metres(1000), LightIntensity = _intensity, Period = LuminanceBand.Night });

        Assert.Equal(RvrQualifier.Above, result.Report.Qualifier);
        Assert.Equal("P2000", result.Report.ToMetar());
    }

    [Fact]
    public void Calculate_FromTransmissometer_GivesMorAbout630()
    {
        // b = 75 m, T = 0.70 → MOR ≈ 630 m: computed from the formulas above (docs/sources.md Optics)
        var result = RvrCalculator.Calculate(new RvrInputs
        {
            Transmittance = 0.70,
            Baseline = new Metres(75),
            LightIntensity = _intensity,
            Period = LuminanceBand.Day,
        });

        Assert.Equal(630, result.Mor.Value, 0.5);
        Assert.Equal(IlluminanceThreshold.Day, result.Threshold);
    }

    [Fact]
    public void Calculate_FromForwardScatterPerKm_MatchesTheEquivalentMor()
    {
        // σ in km⁻¹ as readings give it; MOR = 2.996/σ — CIE ILV 17-31-018; WMO-No. 8
        var sigma = ExtinctionCoefficient.FromPerKm(MeteorologicalOpticalRange.MinusLnThreshold / 0.3);
        var fromSigma = RvrCalculator.Calculate(new RvrInputs { Extinction = sigma, LightIntensity = _intensity, Period = LuminanceBand.Night });

        Assert.Equal(300, fromSigma.Mor.Value, 1e-6);
        Assert.Equal(954, fromSigma.LightsRange.Value, 0.5); // docs/sources.md Optics worked value (computed from the formulas)
    }

    [Fact]
    public void Calculate_LightsOff_RvrIsTheObjectRange()
    {
        // RVR = greater of lights range and object range — ICAO Doc 9328
        var result = RvrCalculator.Calculate(new RvrInputs { Mor = new Metres(420), LightIntensity = new Candela(0), Period = LuminanceBand.Day });

        Assert.Equal(0, result.LightsRange.Value);
        Assert.Equal(420, result.Rvr.Value);
        Assert.Equal("0400", result.Report.ToMetar()); // 50 m steps from 400 — ICAO Annex 3, App 3, §4.3.6 (from memory)
    }

    [Fact]
    public void Calculate_ContinuousThreshold_IsUsedWhenAsked()
    {
        var bands = RvrCalculator.Calculate(new RvrInputs { Mor = new Metres(300), LightIntensity = _intensity, BackgroundLuminance = new(1000) });
        var continuous = RvrCalculator.Calculate(new RvrInputs
        {
            Mor = new Metres(300),
            LightIntensity = _intensity,
            BackgroundLuminance = new(1000),
            ThresholdModel = ThresholdModel.Continuous,
        });

        Assert.Equal(1e-4, bands.Threshold.Value); // ICAO Annex 3, Attachment D (from memory)
        Assert.Equal(-4.498, Math.Log10(continuous.Threshold.Value), 1e-9); // continuous form, recalled for Doc 9328 (unconfirmed)
        Assert.True(continuous.LightsRange > bands.LightsRange); // 3.2e-5 lx is below the band's 1e-4 lx: longer range
    }

    public static TheoryData<RvrInputs, string> BadInputs => new()
    {
        { new RvrInputs { LightIntensity = _intensity, Period = LuminanceBand.Day }, "exactly one of" },
        { new RvrInputs { Mor = new Metres(300), Extinction = ExtinctionCoefficient.FromPerKm(10), LightIntensity = _intensity, Period = LuminanceBand.Day }, "exactly one of" },
        { new RvrInputs { Transmittance = 0.7, LightIntensity = _intensity, Period = LuminanceBand.Day }, "baseline" },
        { new RvrInputs { Mor = new Metres(300), Baseline = new Metres(75), LightIntensity = _intensity, Period = LuminanceBand.Day }, "baseline" },
        { new RvrInputs { Mor = new Metres(300), LightIntensity = _intensity }, "background luminance or a period" },
        { new RvrInputs { Mor = new Metres(300), LightIntensity = _intensity, Period = LuminanceBand.Day, BackgroundLuminance = new(5) }, "not both" },
        { new RvrInputs { Mor = new Metres(0), LightIntensity = _intensity, Period = LuminanceBand.Day }, "MOR must be" },
        { new RvrInputs { Mor = new Metres(300), LightIntensity = new Candela(-5), Period = LuminanceBand.Day }, "light intensity" },
    };

    [Theory]
    [MemberData(nameof(BadInputs))]
    public void Calculate_BadInputs_ThrowNamingTheProblem(RvrInputs inputs, string fragment)
    {
        var ex = Assert.ThrowsAny<ArgumentException>(() => RvrCalculator.Calculate(inputs));
        Assert.Contains(fragment, ex.Message, StringComparison.Ordinal);
    }
}
