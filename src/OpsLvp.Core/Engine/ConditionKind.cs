namespace OpsLvp.Core.Engine;

/// <summary>The conditions of docs/engine.md R4/R5 whose continuous holding is timed by dwells.</summary>
public enum ConditionKind
{
    /// <summary>Active condition (R4).</summary>
    Active,
    /// <summary>Preparation condition (R4).</summary>
    Preparation,
    /// <summary>Recovery from active (R5).</summary>
    RecoveryFromActive,
    /// <summary>Recovery from preparation (R5).</summary>
    RecoveryFromPreparation,
}
