using OpsLvp.Core.Units;

namespace OpsLvp.Core.Reporting;

/// <summary>
/// Turns an assessed RVR into its reported value.
/// Scale: steps of 25 m below 400 m, 50 m from 400 m to 800 m, 100 m above 800 m, rounded down
/// (ICAO Annex 3, App 3, §4.3.6 — from memory). Limits 50 m and 2000 m; outside them "below 50" (<c>M0050</c>) or
/// "above 2000" (<c>P2000</c>) (ICAO Annex 3, App 3, §4.3.6; WMO BUFR code table 0 08 014).
/// </summary>
/// <remarks>
/// Boundary behaviour (decided here; the source does not spell it out): a value exactly on a step boundary is
/// itself a reportable value (400, 800 are multiples of both neighbouring steps), so 399.9 → 375, 400 → 400,
/// 799.9 → 750, 800 → 800, 899.9 → 800. The limits are inclusive: exactly 50 m reports <c>0050</c> and exactly
/// 2000 m reports <c>2000</c>; only values strictly below 50 m give <c>M0050</c> and strictly above 2000 m give
/// <c>P2000</c>. No tolerance is applied: a value is never rounded up, even by a floating-point hair.
/// </remarks>
public static class RvrReporting
{
    /// <summary>Lower reporting limit, 50 m (Annex 3, App 3, §4.3.6).</summary>
    public static readonly Metres LowerLimit = new(50);

    /// <summary>Upper reporting limit, 2000 m (Annex 3, App 3, §4.3.6).</summary>
    public static readonly Metres UpperLimit = new(2000);

    /// <summary>
    /// The reported value of an assessed RVR. <paramref name="rvr"/> must be finite and ≥ 0 m, else
    /// <see cref="ArgumentOutOfRangeException"/>.
    /// </summary>
    public static RvrReport Report(Metres rvr)
    {
        var v = rvr.Value;
        if (!double.IsFinite(v) || v < 0)
        {
            throw new ArgumentOutOfRangeException(nameof(rvr), v, "RVR must be a finite number of metres, 0 or more");
        }
        if (v < LowerLimit.Value)
        {
            return new RvrReport(LowerLimit, RvrQualifier.Below);
        }
        if (v > UpperLimit.Value)
        {
            return new RvrReport(UpperLimit, RvrQualifier.Above);
        }
        return new RvrReport(new Metres(RoundDown(v, StepAt(v))), RvrQualifier.None);
    }

    /// <summary>The reporting step in metres that applies at <paramref name="rvr"/> (25, 50 or 100).</summary>
    public static Metres StepAt(Metres rvr) => new(StepAt(rvr.Value));

    private static double StepAt(double v) => v switch
    {
        < 400 => 25,
        <= 800 => 50,
        _ => 100,
    };

    private static double RoundDown(double value, double step) => Math.Floor(value / step) * step;
}
