using OpsLvp.Core.Optics;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Optics;

public sealed class AllardLawTests
{
    private static readonly Candela _highIntensityEdge = new(10_000); // docs/sources.md Optics worked values use I = 10 000 cd

    private static ExtinctionCoefficient SigmaForMor(double metres) => MeteorologicalOpticalRange.ToExtinction(new Metres(metres));

    [Theory]
    // Worked check values computed from the formulas above (docs/sources.md Optics), I = 10 000 cd;
    // E_T bands — ICAO Annex 3, Attachment D (from memory)
    [InlineData(300, 8e-7, 954)] // MOR 300 m, night → ≈ 954 m
    [InlineData(300, 1e-4, 573)] // MOR 300 m, normal day → ≈ 573 m
    [InlineData(600, 1e-4, 945)] // MOR 600 m, normal day → ≈ 945 m
    public void LightsRange_DomainWorkedValues_Match(double morMetres, double thresholdLux, double expectedMetres)
    {
        var range = AllardLaw.LightsRange(_highIntensityEdge, SigmaForMor(morMetres), new Lux(thresholdLux));

        Assert.Equal(expectedMetres, range.Value, 0.5);
    }

    [Fact]
    public void LightsRange_MorThousandAtNight_IsAboveTwoThousand()
    {
        // MOR 1000 m at night → above 2000 m: computed from the formulas above (docs/sources.md Optics)
        var range = AllardLaw.LightsRange(_highIntensityEdge, SigmaForMor(1000), IlluminanceThreshold.Night);

        Assert.True(range.Value > 2000, $"lights range {range.Value} m");
    }

    [Theory]
    [InlineData(300, 8e-7)]
    [InlineData(50, 1e-3)]
    [InlineData(5000, 8e-7)]
    public void LightsRange_IsSeenThereAndNotBeyondTheTolerance(double morMetres, double thresholdLux)
    {
        // Allard's law E = I·exp(−σR)/R², seen while E ≥ E_T — CIE ILV 17-31-025; tolerance is AllardLaw's documented one
        var sigma = SigmaForMor(morMetres);
        var threshold = new Lux(thresholdLux);
        var range = AllardLaw.LightsRange(_highIntensityEdge, sigma, threshold);

        Assert.True(AllardLaw.Illuminance(_highIntensityEdge, sigma, range).Value >= thresholdLux);
        var beyond = new Metres(range.Value + (2 * AllardLaw.ToleranceMetres));
        Assert.True(AllardLaw.Illuminance(_highIntensityEdge, sigma, beyond).Value < thresholdLux);
    }

    [Fact]
    public void Illuminance_AtOneHundredMetresInClearishAir_FollowsAllard()
    {
        // E = I·exp(−σR)/R² — CIE ILV 17-31-025; σ = 1 km⁻¹, R = 100 m: 10 000·e^(−0.1)/10 000 = e^(−0.1)
        var e = AllardLaw.Illuminance(_highIntensityEdge, ExtinctionCoefficient.FromPerKm(1), new Metres(100));

        Assert.Equal(Math.Exp(-0.1), e.Value, 1e-12);
    }

    [Fact]
    public void LightsRange_LightsOff_IsZero()
    {
        Assert.Equal(0, AllardLaw.LightsRange(new Candela(0), SigmaForMor(300), IlluminanceThreshold.Night).Value);
    }

    [Fact]
    public void LightsRange_ThickerFog_IsShorter()
    {
        var thin = AllardLaw.LightsRange(_highIntensityEdge, SigmaForMor(600), IlluminanceThreshold.Day);
        var thick = AllardLaw.LightsRange(_highIntensityEdge, SigmaForMor(300), IlluminanceThreshold.Day);

        Assert.True(thick < thin);
    }

    [Fact]
    public void LightsRange_BadArguments_AreRejected()
    {
        var sigma = SigmaForMor(300);
        Assert.Throws<ArgumentOutOfRangeException>(() => AllardLaw.LightsRange(new Candela(-1), sigma, IlluminanceThreshold.Day));
        Assert.Throws<ArgumentOutOfRangeException>(() => AllardLaw.LightsRange(_highIntensityEdge, sigma, new Lux(0)));
        Assert.Throws<ArgumentOutOfRangeException>(() => AllardLaw.LightsRange(_highIntensityEdge, default, IlluminanceThreshold.Day));
        Assert.Throws<ArgumentOutOfRangeException>(() => AllardLaw.Illuminance(_highIntensityEdge, sigma, new Metres(0)));
    }
}
