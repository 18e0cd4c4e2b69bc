using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>
/// The physical ranges and sensor capabilities the engine screens readings against (DESIGN R1). Ranges are
/// inclusive, chosen wide enough for any real instrument and narrow enough to catch unit and parsing errors
/// (common practice, not from a standard): RVR 0–10 000 m, visibility 0–100 000 m, cloud base and vertical
/// visibility 0–50 000 ft, extinction 0–1000 per km, transmittance 0–1, background luminance 0–100 000 cd/m².
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
        _ => (double.NaN, double.NaN),
    };

    /// <summary>True when <paramref name="value"/> is finite and inside the kind's range.</summary>
    public static bool InRange(ReadingKind kind, double value)
    {
        var (min, max) = Range(kind);
        return double.IsFinite(value) && value >= min && value <= max;
    }

    /// <summary>
    /// The kinds a sensor type may send. RVR-capable instruments may also send the RVR their own system
    /// computed and a visibility (MOR); raw kinds (extinction, transmittance, luminance) are accepted and kept
    /// but only <see cref="ReadingKind.Rvr"/> readings govern the phase.
    /// </summary>
    public static IReadOnlyList<ReadingKind> KindsProduced(SensorType type) => type switch
    {
        SensorType.RvrSystem => [ReadingKind.Rvr, ReadingKind.Visibility],
        SensorType.Transmissometer => [ReadingKind.Transmittance, ReadingKind.Rvr, ReadingKind.Visibility],
        SensorType.ForwardScatter => [ReadingKind.Extinction, ReadingKind.Rvr, ReadingKind.Visibility],
        SensorType.Ceilometer => [ReadingKind.CloudBase, ReadingKind.VerticalVisibility],
        SensorType.Visibility => [ReadingKind.Visibility],
        SensorType.Luminance => [ReadingKind.BackgroundLuminance],
        _ => [],
    };

    /// <summary>The kind whose maximum age decides when a sensor that never reported counts as silent.</summary>
    public static ReadingKind PrimaryKind(SensorType type) => type switch
    {
        SensorType.RvrSystem or SensorType.Transmissometer or SensorType.ForwardScatter => ReadingKind.Rvr,
        SensorType.Ceilometer => ReadingKind.CloudBase,
        SensorType.Luminance => ReadingKind.BackgroundLuminance,
        _ => ReadingKind.Visibility,
    };

    /// <summary>Whether the sensor type can give an RVR reading.</summary>
    public static bool GivesRvr(SensorType type) => type is SensorType.RvrSystem or SensorType.Transmissometer or SensorType.ForwardScatter;
}
