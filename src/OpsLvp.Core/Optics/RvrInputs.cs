using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// A raw reading context for one RVR assessment. Give exactly one atmosphere source — <see cref="Mor"/>,
/// <see cref="Extinction"/> (forward-scatter meter), or <see cref="Transmittance"/> with <see cref="Baseline"/>
/// (transmissometer) — and exactly one of <see cref="BackgroundLuminance"/> or <see cref="Period"/>.
/// <see cref="RvrCalculator.Calculate(RvrInputs)"/> checks this and throws <see cref="ArgumentException"/> naming what is wrong.
/// </summary>
public sealed record RvrInputs
{
    /// <summary>MOR given directly, metres (&gt; 0).</summary>
    public Metres? Mor { get; init; }

    /// <summary>Extinction coefficient σ (readings give it per km: <see cref="ExtinctionCoefficient.FromPerKm"/>).</summary>
    public ExtinctionCoefficient? Extinction { get; init; }

    /// <summary>Transmissometer transmittance, dimensionless, strictly between 0 and 1; needs <see cref="Baseline"/>.</summary>
    public double? Transmittance { get; init; }

    /// <summary>Transmissometer baseline, metres (&gt; 0); only with <see cref="Transmittance"/>.</summary>
    public Metres? Baseline { get; init; }

    /// <summary>Intensity of the runway lights in use at the current brightness setting, candela (≥ 0; 0 = lights off).</summary>
    public required Candela LightIntensity { get; init; }

    /// <summary>Measured background luminance, cd/m² (≥ 0).</summary>
    public CandelaPerSquareMetre? BackgroundLuminance { get; init; }

    /// <summary>The period, when no luminance is measured; mapped by <see cref="IlluminanceThreshold.RepresentativeLuminance"/>.</summary>
    public LuminanceBand? Period { get; init; }

    /// <summary>How E_T follows from luminance; the Annex 3 bands by default.</summary>
    public ThresholdModel ThresholdModel { get; init; } = ThresholdModel.AnnexBands;

    /// <summary>
    /// These inputs with no background luminance known (docs/engine.md R19): the period
    /// <see cref="IlluminanceThreshold.UnknownLuminanceBand"/> under the Annex 3 bands, whose threshold gives the lowest
    /// lights range of all bands. A caller that uses this must flag the result "luminance unknown".
    /// </summary>
    public RvrInputs WithUnknownLuminance() =>
        this with { BackgroundLuminance = null, Period = IlluminanceThreshold.UnknownLuminanceBand, ThresholdModel = ThresholdModel.AnnexBands };
}
