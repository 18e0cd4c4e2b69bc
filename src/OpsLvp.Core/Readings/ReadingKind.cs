namespace OpsLvp.Core.Readings;

/// <summary>What a reading measures; the unit of <see cref="Reading.Value"/> follows from the kind.</summary>
public enum ReadingKind
{
    /// <summary>Runway visual range, metres.</summary>
    Rvr,
    /// <summary>Visibility (MOR or prevailing), metres.</summary>
    Visibility,
    /// <summary>Cloud base, feet above aerodrome level.</summary>
    CloudBase,
    /// <summary>Vertical visibility, feet above aerodrome level.</summary>
    VerticalVisibility,
    /// <summary>Extinction coefficient σ, per kilometre (raw forward-scatter output).</summary>
    Extinction,
    /// <summary>Transmittance over the sensor's baseline, dimensionless 0..1 (raw transmissometer output).</summary>
    Transmittance,
    /// <summary>Background luminance, cd/m².</summary>
    BackgroundLuminance,
    /// <summary>
    /// Runway-light intensity step in use (a whole number; 0 = lights off), from a lighting sensor (docs/engine.md R20).
    /// </summary>
    LightStep,
}
