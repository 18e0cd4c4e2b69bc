using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// Turns raw transmissometer or forward-scatter readings into RVR: MOR from σ or T+b (WMO-No. 8), lights range by
/// Allard's law with E_T from background luminance (CIE ILV 17-31-025; Annex 3 Attachment D — from memory), object
/// range by Koschmieder (= MOR), RVR = the greater of the two (ICAO Doc 9328), reported on the Annex 3 scale.
/// </summary>
public static class RvrCalculator
{
    /// <summary>
    /// Assesses <paramref name="inputs"/>. Throws <see cref="ArgumentException"/> (or its subclass
    /// <see cref="ArgumentOutOfRangeException"/>) naming the problem when the inputs are incomplete, contradictory or
    /// out of range.
    /// </summary>
    public static RvrAssessment Calculate(RvrInputs inputs)
    {
        ArgumentNullException.ThrowIfNull(inputs);
        var extinction = ResolveExtinction(inputs);
        var threshold = IlluminanceThreshold.FromBackground(ResolveLuminance(inputs), inputs.ThresholdModel);
        // A MOR given directly is kept as given rather than recomputed from σ, which could come back a hair below it.
        var mor = inputs.Mor ?? MeteorologicalOpticalRange.FromExtinction(extinction);
        return Assess(extinction, mor, inputs.LightIntensity, threshold);
    }

    /// <summary>Assesses a known σ, light intensity and threshold; argument rules as in <see cref="AllardLaw.LightsRange"/>.</summary>
    public static RvrAssessment Calculate(ExtinctionCoefficient extinction, Candela lightIntensity, Lux threshold) =>
        Assess(extinction, MeteorologicalOpticalRange.FromExtinction(extinction), lightIntensity, threshold);

    private static RvrAssessment Assess(ExtinctionCoefficient extinction, Metres mor, Candela lightIntensity, Lux threshold)
    {
        var lights = AllardLaw.LightsRange(lightIntensity, extinction, threshold);
        // Koschmieder with ε = 0.05 is the MOR itself.
        var objects = mor;
        var rvr = lights > objects ? lights : objects;
        return new RvrAssessment(mor, lights, objects, rvr, threshold, RvrReporting.Report(rvr));
    }

    private static ExtinctionCoefficient ResolveExtinction(RvrInputs inputs)
    {
        var given = (inputs.Mor is null ? 0 : 1) + (inputs.Extinction is null ? 0 : 1) + (inputs.Transmittance is null ? 0 : 1);
        if (given != 1)
        {
            throw new ArgumentException(
                "give exactly one of MOR, extinction coefficient, or transmittance with baseline" + (given == 0 ? "" : $" (got {given})"),
                nameof(inputs));
        }
        if (inputs.Baseline is not null && inputs.Transmittance is null)
        {
            throw new ArgumentException("a transmissometer baseline is only meaningful with a transmittance", nameof(inputs));
        }
        if (inputs.Mor is { } mor)
        {
            return MeteorologicalOpticalRange.ToExtinction(mor);
        }
        if (inputs.Extinction is { } sigma)
        {
            if (!(sigma.PerMetre > 0))
            {
                throw new ArgumentOutOfRangeException(nameof(inputs), sigma.PerMetre, "extinction coefficient must be greater than 0");
            }
            return sigma;
        }
        if (inputs.Baseline is not { } baseline)
        {
            throw new ArgumentException("a transmittance needs the transmissometer baseline", nameof(inputs));
        }
        return MeteorologicalOpticalRange.ExtinctionFromTransmittance(inputs.Transmittance!.Value, baseline);
    }

    private static CandelaPerSquareMetre ResolveLuminance(RvrInputs inputs) => (inputs.BackgroundLuminance, inputs.Period) switch
    {
        ({ } b, null) => b,
        (null, { } period) => IlluminanceThreshold.RepresentativeLuminance(period),
        (null, null) => throw new ArgumentException("give a background luminance or a period", nameof(inputs)),
        _ => throw new ArgumentException("give a background luminance or a period, not both", nameof(inputs)),
    };
}
