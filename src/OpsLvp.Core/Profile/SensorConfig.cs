namespace OpsLvp.Core.Profile;

/// <summary>
/// A sensor. RVR sensors are placed on a runway: <paramref name="Sites"/> maps each runway direction to
/// the position the sensor stands for when that direction is in use (a sensor near the 09 threshold is
/// TDZ for 09 and END for 27).
/// </summary>
/// <param name="Id">Sensor id, unique in the profile.</param>
/// <param name="Type">Instrument type.</param>
/// <param name="Runway">Runway id for RVR sensors; null for others.</param>
/// <param name="Sites">Direction → position, for RVR sensors.</param>
/// <param name="BaselineM">Transmissometer baseline in metres (required for transmissometers).</param>
/// <param name="LuminanceSensor">Id of the luminance sensor used for this RVR sensor's computation; null: any.</param>
/// <param name="MaxAgeSeconds">
/// Maximum age of this sensor's readings, every kind, in seconds (&gt; 0); overrides the profile's per-kind
/// <c>maxAgeSeconds</c> so a half-hourly METAR source and a 15-second sensor can both be right (docs/engine.md R21).
/// Null: the per-kind value.
/// </param>
public sealed record SensorConfig(
    string Id,
    SensorType Type,
    string? Runway = null,
    IReadOnlyDictionary<string, RvrPosition>? Sites = null,
    double? BaselineM = null,
    string? LuminanceSensor = null,
    int? MaxAgeSeconds = null);
