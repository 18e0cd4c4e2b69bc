using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>
/// The physical ranges the engine screens readings against (docs/engine.md R1; the kinds each sensor type
/// produces are in <see cref="SensorKinds"/>). Ranges are
/// inclusive, chosen wide enough for any real instrument and narrow enough to catch unit and parsing errors
/// (common practice, not from a standard): RVR 0–10 000 m, visibility 0–100 000 m, cloud base and vertical
/// visibility 0–50 000 ft, extinction 0–1000 per km, transmittance 0–1, background luminance 0–100 000 cd/m²,
/// light step 0–100.
/// NaN and infinities are always out of range.
/// </summary>
public static class ReadingScreen
{
    /// <summary>Inclusive physical range of a kind, in its unit.</summary>
    public static (double Min, double Max) Range(ReadingKind kind) => kind switch
    {
        ReadingKind.Rvr => (0, 10_000),
        ReadingKind.Visibility => (0, 100_000),
        ReadingKind.CloudBase => (0, 50_000),
        ReadingKind.VerticalVisibility => (0, 50_000),
        ReadingKind.Extinction => (0, 1_000),
        ReadingKind.Transmittance => (0, 1),
        ReadingKind.BackgroundLuminance => (0, 100_000),
        ReadingKind.LightStep => (0, 100),
        _ => (double.NaN, double.NaN),
    };

    /// <summary>True when <paramref name="value"/> is finite and inside the kind's range.</summary>
    public static bool InRange(ReadingKind kind, double value)
    {
        var (min, max) = Range(kind);
        return double.IsFinite(value) && value >= min && value <= max;
    }
}
