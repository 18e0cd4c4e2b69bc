namespace OpsLvp.Core.Engine;

/// <summary>A value with the sensor that gave it and its freshness.</summary>
/// <param name="Value">Metres for RVR, feet for ceiling.</param>
/// <param name="Label">For RVR, direction and position, e.g. "07 TDZ"; for ceiling the sensor id.</param>
/// <param name="AgeSeconds">Now − reading time.</param>
/// <param name="Stale">True once the reading is past its kind's maximum age (docs/engine.md R2).</param>
/// <param name="SensorId">The sensor that gave the value.</param>
/// <param name="Time">The reading time.</param>
/// <param name="Flags">What the value stands for when not a plain measurement: "or more", "luminance unknown" (docs/engine.md R19–R22).</param>
public sealed record MeasuredValue(
    double Value,
    string SensorId,
    string Label,
    DateTimeOffset Time,
    double AgeSeconds,
    bool Stale,
    Readings.ReadingFlags Flags = Readings.ReadingFlags.None);
