using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Capability;

/// <summary>The RVR at one position of one runway direction as the capability sees it.</summary>
/// <param name="Direction">Runway direction.</param>
/// <param name="Position">TDZ, MID or END for that direction.</param>
/// <param name="ValueM">Metres; null when there is no value.</param>
/// <param name="Source">Sensor or observer (meaningful when <paramref name="ValueM"/> is set).</param>
/// <param name="Gap">Why the sensor gives nothing (set even when an observer's value stands in).</param>
/// <param name="Observer">The observer's name when <paramref name="Source"/> is observer.</param>
public sealed record PositionValue(string Direction, RvrPosition Position, double? ValueM, RvrSource Source, PositionGap? Gap, string? Observer = null);
