using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// Koschmieder's law for objects and markings: range = −ln(ε)/σ with contrast threshold ε = 0.05, which is the MOR
/// (WMO-No. 8; ICAO Doc 9328).
/// </summary>
public static class Koschmieder
{
    /// <summary>The range at which a black object against the horizon sky is just seen, in metres (= MOR).</summary>
    public static Metres ObjectRange(ExtinctionCoefficient extinction) => MeteorologicalOpticalRange.FromExtinction(extinction);
}
