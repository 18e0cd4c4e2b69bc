namespace OpsLvp.Core.Engine;

/// <summary>
/// The values a decision was taken on (docs/engine.md R12 "condition snapshot"): governing RVR and ceiling with
/// the sensors that gave them, null when unknown, and the thresholds in effect.
/// </summary>
public sealed record ConditionSnapshot(
    DateTimeOffset At,
    double? GoverningRvrM,
    string? GoverningRvrSensor,
    double? CeilingFt,
    string? CeilingSensor,
    bool DeteriorationForecast,
    bool RecoveryInputsComplete,
    Profile.ThresholdSet Thresholds);
