using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// Meteorological optical range (MOR): the path that reduces a collimated beam from a 2700 K lamp to 5 % of its flux,
/// MOR = −ln(0.05)/σ ≈ 2.996/σ (CIE ILV 17-31-018; WMO-No. 8). The 2 % variant (3.912/σ) is deliberately not offered.
/// With σ in m⁻¹ the MOR is in metres; a σ of 10 km⁻¹ gives ≈ 299.6 m.
/// </summary>
public static class MeteorologicalOpticalRange
{
    /// <summary>The 5 % contrast/flux threshold that defines MOR (CIE ILV 17-31-018).</summary>
    public const double Threshold = 0.05;

    /// <summary>−ln(0.05) ≈ 2.9957, the numerator of MOR = −ln(0.05)/σ.</summary>
    public static readonly double MinusLnThreshold = -Math.Log(Threshold);

    /// <summary>MOR in metres from σ (any positive σ; see <see cref="ExtinctionCoefficient"/> for units).</summary>
    public static Metres FromExtinction(ExtinctionCoefficient extinction)
    {
        if (!(extinction.PerMetre > 0))
        {
            throw new ArgumentOutOfRangeException(nameof(extinction), extinction.PerMetre, "extinction coefficient must be greater than 0");
        }
        return new Metres(MinusLnThreshold / extinction.PerMetre);
    }

    /// <summary>
    /// MOR from a transmissometer: T = exp(−σ·b), so MOR = b·ln(0.05)/ln(T) (WMO-No. 8). <paramref name="transmittance"/>
    /// is dimensionless and must lie strictly between 0 and 1 (T = 1 means no measurable extinction, no finite MOR;
    /// T = 0 means no light received); <paramref name="baseline"/> must be finite and &gt; 0 m. Otherwise
    /// <see cref="ArgumentOutOfRangeException"/>.
    /// </summary>
    public static Metres FromTransmittance(double transmittance, Metres baseline) =>
        FromExtinction(ExtinctionFromTransmittance(transmittance, baseline));

    /// <summary>σ = −ln(T)/b from a transmittance over a baseline; same argument rules as <see cref="FromTransmittance"/>.</summary>
    public static ExtinctionCoefficient ExtinctionFromTransmittance(double transmittance, Metres baseline)
    {
        if (!double.IsFinite(transmittance) || transmittance <= 0 || transmittance >= 1)
        {
            throw new ArgumentOutOfRangeException(nameof(transmittance), transmittance, "transmittance must be greater than 0 and less than 1");
        }
        if (!double.IsFinite(baseline.Value) || baseline.Value <= 0)
        {
            throw new ArgumentOutOfRangeException(nameof(baseline), baseline.Value, "transmissometer baseline must be a finite number of metres greater than 0");
        }
        return ExtinctionCoefficient.FromPerMetre(-Math.Log(transmittance) / baseline.Value);
    }

    /// <summary>σ = −ln(0.05)/MOR. <paramref name="mor"/> must be finite and &gt; 0 m, else <see cref="ArgumentOutOfRangeException"/>.</summary>
    public static ExtinctionCoefficient ToExtinction(Metres mor)
    {
        if (!double.IsFinite(mor.Value) || mor.Value <= 0)
        {
            throw new ArgumentOutOfRangeException(nameof(mor), mor.Value, "MOR must be a finite number of metres greater than 0");
        }
        return ExtinctionCoefficient.FromPerMetre(MinusLnThreshold / mor.Value);
    }
}
