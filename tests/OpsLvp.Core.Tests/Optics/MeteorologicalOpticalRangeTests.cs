using OpsLvp.Core.Optics;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Optics;

public sealed class MeteorologicalOpticalRangeTests
{
    [Fact]
    public void Mor_FromExtinctionPerKm_Is2996OverSigma()
    {
        // MOR = −ln(0.05)/σ = 2.996/σ — CIE ILV 17-31-018; WMO-No. 8. σ = 10 km⁻¹ → 0.2996 km
        var mor = MeteorologicalOpticalRange.FromExtinction(ExtinctionCoefficient.FromPerKm(10));

        Assert.Equal(299.57, mor.Value, 0.01);
    }

    [Fact]
    public void Extinction_PerKmAndPerMetre_AreTheSameQuantity()
    {
        var sigma = ExtinctionCoefficient.FromPerKm(3);

        Assert.Equal(0.003, sigma.PerMetre, 1e-15);
        Assert.Equal(3, sigma.PerKm, 1e-12);
        Assert.Equal(sigma, ExtinctionCoefficient.FromPerMetre(0.003));
    }

    [Fact]
    public void Mor_FromTransmittance_75mBaseline070_IsAbout630m()
    {
        // b = 75 m, T = 0.70 → MOR ≈ 630 m: computed from the formulas above (docs/sources.md Optics); MOR = b·ln 0.05/ln T (WMO-No. 8)
        var mor = MeteorologicalOpticalRange.FromTransmittance(0.70, new Metres(75));

        Assert.Equal(630, mor.Value, 0.5);
    }

    [Fact]
    public void Mor_ThroughExtinction_RoundTrips()
    {
        var sigma = MeteorologicalOpticalRange.ToExtinction(new Metres(550));

        Assert.Equal(550, MeteorologicalOpticalRange.FromExtinction(sigma).Value, 1e-9);
        Assert.Equal(550, Koschmieder.ObjectRange(sigma).Value, 1e-9); // Koschmieder ε = 0.05 is MOR — WMO-No. 8
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(1.0)]
    [InlineData(-0.2)]
    [InlineData(1.2)]
    [InlineData(double.NaN)]
    public void Mor_FromTransmittanceOutsideOpenUnitInterval_IsRejected(double transmittance)
    {
        var ex = Assert.Throws<ArgumentOutOfRangeException>(() => MeteorologicalOpticalRange.FromTransmittance(transmittance, new Metres(75)));
        Assert.Contains("transmittance must be", ex.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(-75.0)]
    public void Mor_FromTransmittanceWithoutPositiveBaseline_IsRejected(double baseline)
    {
        var ex = Assert.Throws<ArgumentOutOfRangeException>(() => MeteorologicalOpticalRange.FromTransmittance(0.7, new Metres(baseline)));
        Assert.Contains("baseline", ex.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(-1.0)]
    [InlineData(double.PositiveInfinity)]
    public void Extinction_NotPositiveOrNotFinite_IsRejected(double perKm)
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => ExtinctionCoefficient.FromPerKm(perKm));
    }

    [Fact]
    public void Mor_FromDefaultExtinction_IsRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => MeteorologicalOpticalRange.FromExtinction(default));
    }
}
