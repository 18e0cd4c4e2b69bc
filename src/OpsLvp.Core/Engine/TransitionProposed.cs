namespace OpsLvp.Core.Engine;

/// <summary>A transition that needs confirmation became due; it is now pending (docs/engine.md R10).</summary>
public sealed record TransitionProposed(DateTimeOffset At, Phase From, Phase To, string Reason, ConditionSnapshot Snapshot) : EngineEvent(At);
