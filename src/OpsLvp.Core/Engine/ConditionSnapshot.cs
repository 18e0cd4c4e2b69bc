namespace OpsLvp.Core.Engine;

/// <summary>
/// The values a decision was taken on (docs/engine.md R12 "condition snapshot"): governing RVR and ceiling with
/// the sensors that gave them, null when unknown, and the thresholds in effect. <see cref="GoverningRvrFlags"/> says
/// when the governing RVR was a lower bound or derived on a conservative fallback (docs/engine.md R19–R22).
/// </summary>
public sealed record ConditionSnapshot(
    DateTimeOffset At,
    double? GoverningRvrM,
    string? GoverningRvrSensor,
    double? CeilingFt,
    string? CeilingSensor,
    bool DeteriorationForecast,
    bool RecoveryInputsComplete,
    Profile.ThresholdSet Thresholds,
    Readings.ReadingFlags GoverningRvrFlags = Readings.ReadingFlags.None);
