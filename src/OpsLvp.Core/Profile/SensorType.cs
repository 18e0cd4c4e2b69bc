namespace OpsLvp.Core.Profile;

/// <summary>What kind of instrument a sensor is; decides which reading kinds it may send.</summary>
public enum SensorType
{
    /// <summary>An instrument or system that reports RVR directly (metres).</summary>
    RvrSystem,
    /// <summary>Transmissometer: transmittance over <see cref="SensorConfig.BaselineM"/>, RVR computed by Core.</summary>
    Transmissometer,
    /// <summary>Forward-scatter meter: extinction coefficient, RVR computed by Core.</summary>
    ForwardScatter,
    /// <summary>Ceilometer: cloud base and vertical visibility (feet).</summary>
    Ceilometer,
    /// <summary>Visibility sensor or observer: visibility (metres).</summary>
    Visibility,
    /// <summary>Background luminance meter (cd/m²).</summary>
    Luminance,
    /// <summary>The airfield lighting control: the runway-light intensity step in use (docs/engine.md R20).</summary>
    Lighting,
}
