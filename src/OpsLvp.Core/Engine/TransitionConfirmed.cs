namespace OpsLvp.Core.Engine;

/// <summary>A duty manager confirmed the pending transition; a <see cref="PhaseTransition"/> follows at the same instant.</summary>
public sealed record TransitionConfirmed(DateTimeOffset At, string Actor, Phase From, Phase To, DateTimeOffset ProposedAt, string? Reason) : EngineEvent(At);
