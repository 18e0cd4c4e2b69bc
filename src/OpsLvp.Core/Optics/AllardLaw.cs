using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// Allard's law for lights: E = I·exp(−σ·R)/R², the illuminance at distance R (m) from a light of intensity I (cd)
/// through air of extinction σ (m⁻¹); the light is seen while E ≥ the observer's threshold E_T (CIE ILV 17-31-025).
/// </summary>
public static class AllardLaw
{
    /// <summary>Absolute tolerance of <see cref="LightsRange"/> in metres (relative 1e-12 for ranges beyond 1000 km).</summary>
    public const double ToleranceMetres = 1e-6;

    private const int MaxIterations = 200;

    /// <summary>
    /// E in lux at <paramref name="distance"/> (&gt; 0 m). Intensity must be finite and ≥ 0 cd; otherwise
    /// <see cref="ArgumentOutOfRangeException"/>.
    /// </summary>
    public static Lux Illuminance(Candela intensity, ExtinctionCoefficient extinction, Metres distance)
    {
        CheckIntensity(intensity);
        if (!double.IsFinite(distance.Value) || distance.Value <= 0)
        {
            throw new ArgumentOutOfRangeException(nameof(distance), distance.Value, "distance must be a finite number of metres greater than 0");
        }
        var r = distance.Value;
        return new Lux(intensity.Value * Math.Exp(-extinction.PerMetre * r) / (r * r));
    }

    /// <summary>
    /// The lights range: the distance R where E(R) = E_T, in metres.
    /// </summary>
    /// <remarks>
    /// Solved by bisection on g(R) = ln I − ln E_T − σR − 2·ln R, which is strictly decreasing for R &gt; 0
    /// (g′ = −σ − 2/R &lt; 0), so the root is unique. Bracket: the upper end is the range without extinction,
    /// √(I/E_T), where g = −σ·√(I/E_T) ≤ 0; the lower end is halved from there until g &gt; 0 (g → +∞ as R → 0).
    /// Each step halves the bracket; it stops when the bracket is narrower than <see cref="ToleranceMetres"/>
    /// (or 1e-12 of the range), at most 200 steps (about 40 are needed for a 10 km bracket). The returned value is the
    /// lower end of the final bracket: the light is still seen there (E ≥ E_T), and it is within the tolerance
    /// below the exact root, never above it. Intensity 0 cd (lights off) gives 0 m.
    /// Intensity must be finite and ≥ 0, threshold finite and &gt; 0, σ &gt; 0; otherwise
    /// <see cref="ArgumentOutOfRangeException"/>.
    /// </remarks>
    public static Metres LightsRange(Candela intensity, ExtinctionCoefficient extinction, Lux threshold)
    {
        CheckIntensity(intensity);
        if (!double.IsFinite(threshold.Value) || threshold.Value <= 0)
        {
            throw new ArgumentOutOfRangeException(nameof(threshold), threshold.Value, "illuminance threshold must be a finite number of lux greater than 0");
        }
        if (!(extinction.PerMetre > 0))
        {
            throw new ArgumentOutOfRangeException(nameof(extinction), extinction.PerMetre, "extinction coefficient must be greater than 0");
        }
        if (intensity.Value == 0)
        {
            return new Metres(0);
        }

        var lnRatio = Math.Log(intensity.Value) - Math.Log(threshold.Value);
        var sigma = extinction.PerMetre;
        double G(double r) => lnRatio - (sigma * r) - (2 * Math.Log(r));

        var hi = Math.Sqrt(intensity.Value / threshold.Value);
        var lo = hi / 2;
        for (var i = 0; i < MaxIterations && G(lo) <= 0; i++)
        {
            hi = lo;
            lo /= 2;
        }
        if (G(lo) <= 0)
        {
            // Only reachable for intensities so small that the range is below any representable bracket.
            return new Metres(0);
        }

        var tolerance = Math.Max(ToleranceMetres, hi * 1e-12);
        for (var i = 0; i < MaxIterations && hi - lo > tolerance; i++)
        {
            var mid = lo + ((hi - lo) / 2);
            if (G(mid) >= 0)
            {
                lo = mid;
            }
            else
            {
                hi = mid;
            }
        }
        return new Metres(lo);
    }

    private static void CheckIntensity(Candela intensity)
    {
        if (!double.IsFinite(intensity.Value) || intensity.Value < 0)
        {
            throw new ArgumentOutOfRangeException(nameof(intensity), intensity.Value, "light intensity must be a finite number of candela, 0 or more");
        }
    }
}
