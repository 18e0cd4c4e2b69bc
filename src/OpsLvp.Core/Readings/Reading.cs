namespace OpsLvp.Core.Readings;

/// <summary>
/// One sensor reading (docs/engine.md R1). <paramref name="Value"/> is in the unit of <paramref name="Kind"/>:
/// metres for RVR and visibility, feet for cloud base and vertical visibility, per km for extinction,
/// 0..1 for transmittance, cd/m² for background luminance. <paramref name="Flags"/> says what the value stands for
/// when it is not a plain measurement (a lower bound, or RVR derived on a conservative fallback).
/// </summary>
public sealed record Reading(
    DateTimeOffset Time,
    string SensorId,
    ReadingKind Kind,
    double Value,
    ReadingStatus Status = ReadingStatus.Ok,
    ReadingFlags Flags = ReadingFlags.None);
