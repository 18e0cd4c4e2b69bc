using OpsLvp.Core.Units;

namespace OpsLvp.Core.Reporting;

/// <summary>
/// Turns a visibility into its reported value. Steps: 50 m below 800 m; 100 m from 800 m to below 5 km; 1 km from
/// 5 km to below 10 km; 10 km or more is reported as 10 km (<c>9999</c>). Rounded down.
/// (ICAO Annex 3, App 3, §4.2 — from memory; also common practice.)
/// </summary>
/// <remarks>
/// Boundaries: 800 m, 5000 m and 10 000 m belong to the upper band (799.9 → 750, 800 → 800, 4999.9 → 4900,
/// 5000 → 5000, 9999.9 → 9000, 10 000 → 10 km or more). Below 50 m the report is 0 m (<c>0000</c>).
/// </remarks>
public static class VisibilityReporting
{
    /// <summary>10 km: at or above it visibility is reported as 10 km (<c>9999</c>).</summary>
    public static readonly Metres TenKilometres = new(10_000);

    /// <summary>
    /// The reported value of a visibility. <paramref name="visibility"/> must be finite and ≥ 0 m, else
    /// <see cref="ArgumentOutOfRangeException"/>.
    /// </summary>
    public static VisibilityReport Report(Metres visibility)
    {
        var v = visibility.Value;
        if (!double.IsFinite(v) || v < 0)
        {
            throw new ArgumentOutOfRangeException(nameof(visibility), v, "visibility must be a finite number of metres, 0 or more");
        }
        if (v >= TenKilometres.Value)
        {
            return new VisibilityReport(TenKilometres);
        }
        var step = v switch
        {
            < 800 => 50.0,
            < 5000 => 100.0,
            _ => 1000.0,
        };
        return new VisibilityReport(new Metres(Math.Floor(v / step) * step));
    }
}
