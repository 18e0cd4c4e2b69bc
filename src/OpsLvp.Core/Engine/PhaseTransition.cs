namespace OpsLvp.Core.Engine;

/// <summary>The phase changed (docs/engine.md R8–R10).</summary>
/// <param name="By">Auto on the conditions; manual on declare, cancel or confirmation.</param>
/// <param name="Actor">The person for manual transitions; null for automatic ones.</param>
/// <param name="Reason">Readable cause, e.g. "RVR 07 TDZ 500 m &lt; 550 m".</param>
/// <param name="Snapshot">The condition values at <see cref="EngineEvent.At"/>.</param>
/// <param name="ProposedAt">For a confirmed transition, when it was proposed (R10 keeps both instants).</param>
/// <param name="At">The instant (UTC).</param>
/// <param name="From">Phase left.</param>
/// <param name="To">Phase entered.</param>
public sealed record PhaseTransition(
    DateTimeOffset At,
    Phase From,
    Phase To,
    TransitionBy By,
    string? Actor,
    string Reason,
    ConditionSnapshot Snapshot,
    DateTimeOffset? ProposedAt = null) : EngineEvent(At);
