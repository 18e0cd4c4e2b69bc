namespace OpsLvp.Core.Engine;

/// <summary>The inputs and conditions of docs/engine.md R3–R5 at one instant.</summary>
internal sealed record Situation(
    DateTimeOffset At,
    double? RvrM,
    GoverningSensor? RvrSensor,
    IReadOnlyList<string> RvrMissing,
    double? CeilingFt,
    string? CeilingSensor,
    IReadOnlyList<string> CeilingMissing,
    bool Forecast,
    bool Active,
    bool Preparation,
    bool RecoveryFromActive,
    bool RecoveryFromPreparation)
{
    public bool Holds(ConditionKind kind) => kind switch
    {
        ConditionKind.Active => Active,
        ConditionKind.Preparation => Preparation,
        ConditionKind.RecoveryFromActive => RecoveryFromActive,
        _ => RecoveryFromPreparation,
    };
}
