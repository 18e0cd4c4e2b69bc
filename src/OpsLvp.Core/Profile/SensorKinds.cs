using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Profile;

/// <summary>
/// The one table of which reading kinds each sensor type produces (docs/engine.md R1). The engine screens
/// readings against it and the profile validator asks a maximum age for every kind it lists, so the two
/// cannot disagree. RVR-capable instruments may also send the RVR their own system computed and a
/// visibility (MOR); raw kinds (extinction, transmittance, luminance) are accepted and kept but only
/// <see cref="ReadingKind.Rvr"/> readings govern the phase.
/// </summary>
public static class SensorKinds
{
    /// <summary>The kinds a sensor of <paramref name="type"/> may send; empty for an unknown type.</summary>
    public static IReadOnlyList<ReadingKind> Produced(SensorType type) => type switch
    {
        SensorType.RvrSystem => [ReadingKind.Rvr, ReadingKind.Visibility],
        SensorType.Transmissometer => [ReadingKind.Transmittance, ReadingKind.Rvr, ReadingKind.Visibility],
        SensorType.ForwardScatter => [ReadingKind.Extinction, ReadingKind.Rvr, ReadingKind.Visibility],
        SensorType.Ceilometer => [ReadingKind.CloudBase, ReadingKind.VerticalVisibility],
        SensorType.Visibility => [ReadingKind.Visibility],
        SensorType.Luminance => [ReadingKind.BackgroundLuminance],
        SensorType.Lighting => [ReadingKind.LightStep],
        _ => [],
    };

    /// <summary>The kind whose maximum age decides when a sensor that never reported counts as silent.</summary>
    public static ReadingKind Primary(SensorType type) => type switch
    {
        SensorType.RvrSystem or SensorType.Transmissometer or SensorType.ForwardScatter => ReadingKind.Rvr,
        SensorType.Ceilometer => ReadingKind.CloudBase,
        SensorType.Luminance => ReadingKind.BackgroundLuminance,
        SensorType.Lighting => ReadingKind.LightStep,
        _ => ReadingKind.Visibility,
    };

    /// <summary>Whether the sensor type can give an RVR reading.</summary>
    public static bool GivesRvr(SensorType type) => type is SensorType.RvrSystem or SensorType.Transmissometer or SensorType.ForwardScatter;
}
