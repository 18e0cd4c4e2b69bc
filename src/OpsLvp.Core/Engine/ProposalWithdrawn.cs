namespace OpsLvp.Core.Engine;

/// <summary>A pending transition was withdrawn: its condition stopped holding, or a manual action superseded it.</summary>
public sealed record ProposalWithdrawn(DateTimeOffset At, Phase From, Phase To, DateTimeOffset ProposedAt, string Reason) : EngineEvent(At);
