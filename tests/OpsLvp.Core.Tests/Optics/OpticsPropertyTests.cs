using CsCheck;
using OpsLvp.Core.Optics;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Optics;

public sealed class OpticsPropertyTests
{
    private static readonly Gen<double> _sigmaPerKm = Gen.Double[0.1, 100];
    private static readonly Gen<double> _intensity = Gen.Double[1, 50_000];
    private static readonly Gen<double> _luminance = Gen.Double[0, 40_000];

    [Fact]
    public void LightsRange_DecreasesAsExtinctionRises()
    {
        // Allard's law E = I·exp(−σR)/R² falls with σ at every R — CIE ILV 17-31-025
        Gen.Select(_sigmaPerKm, Gen.Double[0.01, 5], _intensity, _luminance).Sample((sigma, rise, intensity, luminance) =>
        {
            var threshold = IlluminanceThreshold.FromBackground(new CandelaPerSquareMetre(luminance));
            var clearer = AllardLaw.LightsRange(new Candela(intensity), ExtinctionCoefficient.FromPerKm(sigma), threshold);
            var thicker = AllardLaw.LightsRange(new Candela(intensity), ExtinctionCoefficient.FromPerKm(sigma * (1 + rise)), threshold);
            return thicker < clearer;
        });
    }

    [Fact]
    public void Rvr_IsNeverBelowMor()
    {
        // RVR = greater of lights range and object range (= MOR) — ICAO Doc 9328
        Gen.Select(_sigmaPerKm, Gen.Double[0, 50_000], _luminance, Gen.Bool).Sample((sigma, intensity, luminance, continuous) =>
        {
            var result = RvrCalculator.Calculate(new RvrInputs
            {
                Extinction = ExtinctionCoefficient.FromPerKm(sigma),
                LightIntensity = new Candela(intensity),
                BackgroundLuminance = new CandelaPerSquareMetre(continuous ? luminance + 0.01 : luminance),
                ThresholdModel = continuous ? ThresholdModel.Continuous : ThresholdModel.AnnexBands,
            });
            return result.Rvr >= result.Mor && result.Rvr >= result.LightsRange && result.Report.Reported.Value <= Math.Max(result.Rvr.Value, 50);
        });
    }

    [Fact]
    public void LightsRange_IsWithinToleranceBelowTheExactRoot()
    {
        // The light is seen while E ≥ E_T — CIE ILV 17-31-025; tolerance as documented on AllardLaw
        Gen.Select(_sigmaPerKm, _intensity, _luminance).Sample((sigma, intensity, luminance) =>
        {
            var i = new Candela(intensity);
            var s = ExtinctionCoefficient.FromPerKm(sigma);
            var threshold = IlluminanceThreshold.FromBackground(new CandelaPerSquareMetre(luminance));
            var range = AllardLaw.LightsRange(i, s, threshold);
            var beyond = new Metres(range.Value + (2 * AllardLaw.ToleranceMetres));
            return AllardLaw.Illuminance(i, s, range).Value >= threshold.Value
                && AllardLaw.Illuminance(i, s, beyond).Value < threshold.Value;
        });
    }

    [Fact]
    public void Mor_FromTransmittance_AgreesWithExtinction()
    {
        // T = exp(−σ·b), so MOR = b·ln 0.05/ln T equals −ln 0.05/σ — WMO-No. 8
        Gen.Select(Gen.Double[0.01, 0.99], Gen.Double[5, 200]).Sample((t, b) =>
        {
            var viaT = MeteorologicalOpticalRange.FromTransmittance(t, new Metres(b)).Value;
            var expected = b * Math.Log(0.05) / Math.Log(t);
            return Math.Abs(viaT - expected) <= 1e-9 * expected;
        });
    }
}
