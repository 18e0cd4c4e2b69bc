using OpsLvp.Core.Units;

namespace OpsLvp.Core.Reporting;

/// <summary>
/// Fog/mist from visibility: <c>FG</c> below 1000 m; <c>BR</c> from 1000 m to 5000 m, both ends inclusive; none above
/// 5000 m (EU Part-MET AMC/GM; common practice). Only visibility is looked at: telling mist from haze (<c>HZ</c>) or
/// smoke (<c>FU</c>) needs humidity or an observer, so the caller decides whether the obscuration is water droplets.
/// </summary>
public static class ObscurationClassifier
{
    /// <summary>Fog is reported below this visibility (exclusive).</summary>
    public static readonly Metres FogBelow = new(1000);

    /// <summary>Mist is reported up to and including this visibility.</summary>
    public static readonly Metres MistUpTo = new(5000);

    /// <summary>
    /// Classifies a visibility in metres as given. Pass the reported value (<see cref="VisibilityReporting.Report"/>)
    /// to agree with the visibility group of the same report: assessed 5000.5 m is no mist, reported 5000 m is. Throws <see cref="ArgumentOutOfRangeException"/> unless finite and ≥ 0.
    /// </summary>
    public static Obscuration Classify(Metres visibility)
    {
        var v = visibility.Value;
        if (!double.IsFinite(v) || v < 0)
        {
            throw new ArgumentOutOfRangeException(nameof(visibility), v, "visibility must be a finite number of metres, 0 or more");
        }
        if (v < FogBelow.Value)
        {
            return Obscuration.Fog;
        }
        return v <= MistUpTo.Value ? Obscuration.Mist : Obscuration.None;
    }

    /// <summary>The METAR weather code: <c>"FG"</c>, <c>"BR"</c>, or <c>null</c> for <see cref="Obscuration.None"/>.</summary>
    public static string? ToMetarCode(Obscuration obscuration) => obscuration switch
    {
        Obscuration.Fog => "FG",
        Obscuration.Mist => "BR",
        Obscuration.None => null,
        _ => throw new ArgumentOutOfRangeException(nameof(obscuration), obscuration, "unknown obscuration"),
    };
}
