using OpsLvp.Core.Optics;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Optics;

public sealed class IlluminanceThresholdTests
{
    [Theory]
    // Bands: night B ≤ 50 → 8×10⁻⁷ lx; 51–999 → 10⁻⁵; 1000–12 000 → 10⁻⁴; > 12 000 → 10⁻³ — ICAO Annex 3, Attachment D (from memory)
    [InlineData(0.0, LuminanceBand.Night, 8e-7)]
    [InlineData(50.0, LuminanceBand.Night, 8e-7)]
    [InlineData(50.5, LuminanceBand.Intermediate, 1e-5)] // between 50 and 51: intermediate (decided in IlluminanceThreshold)
    [InlineData(51.0, LuminanceBand.Intermediate, 1e-5)]
    [InlineData(999.0, LuminanceBand.Intermediate, 1e-5)]
    [InlineData(999.9, LuminanceBand.Intermediate, 1e-5)]
    [InlineData(1000.0, LuminanceBand.Day, 1e-4)]
    [InlineData(12_000.0, LuminanceBand.Day, 1e-4)]
    [InlineData(12_000.5, LuminanceBand.BrightDay, 1e-3)]
    [InlineData(12_001.0, LuminanceBand.BrightDay, 1e-3)]
    public void Threshold_AtBandBoundaries_FollowsTheAnnexBands(double luminance, LuminanceBand band, double lux)
    {
        var b = new CandelaPerSquareMetre(luminance);

        Assert.Equal(band, IlluminanceThreshold.BandOf(b));
        Assert.Equal(lux, IlluminanceThreshold.FromBackground(b).Value);
    }

    [Theory]
    // log10 E_T = 0.05(log10 B)² + 0.573·log10 B − 6.667 — recalled for ICAO Doc 9328, unconfirmed (docs/sources.md Optics)
    [InlineData(1.0, -6.667)]
    [InlineData(1000.0, -4.498)] // 0.05·9 + 0.573·3 − 6.667
    [InlineData(10_000.0, -3.575)] // 0.05·16 + 0.573·4 − 6.667
    public void Threshold_ContinuousForm_FollowsTheFormula(double luminance, double expectedLog10)
    {
        var et = IlluminanceThreshold.FromBackground(new CandelaPerSquareMetre(luminance), ThresholdModel.Continuous);

        Assert.Equal(expectedLog10, Math.Log10(et.Value), 1e-9);
    }

    [Fact]
    public void Threshold_ContinuousFormAtZeroLuminance_IsRejected()
    {
        var ex = Assert.Throws<ArgumentOutOfRangeException>(() =>
            IlluminanceThreshold.FromBackground(new CandelaPerSquareMetre(0), ThresholdModel.Continuous));
        Assert.Contains("continuous", ex.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData(-1.0)]
    [InlineData(double.NaN)]
    public void Threshold_NegativeOrNotFiniteLuminance_IsRejected(double luminance)
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => IlluminanceThreshold.FromBackground(new CandelaPerSquareMetre(luminance)));
    }

    [Theory]
    [InlineData(LuminanceBand.Night)]
    [InlineData(LuminanceBand.Intermediate)]
    [InlineData(LuminanceBand.Day)]
    [InlineData(LuminanceBand.BrightDay)]
    public void RepresentativeLuminance_LiesInsideItsBand(LuminanceBand band)
    {
        // Representative values are invented (IlluminanceThreshold.RepresentativeLuminance); they must stay in their band
        Assert.Equal(band, IlluminanceThreshold.BandOf(IlluminanceThreshold.RepresentativeLuminance(band)));
    }
}
