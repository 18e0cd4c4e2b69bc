namespace OpsLvp.Core.Engine;

/// <summary>A duty manager marked an open item not applicable, with a reason (docs/engine.md R13).</summary>
public sealed record ItemMarkedNotApplicable(DateTimeOffset At, string ItemId, string Actor, string Reason) : EngineEvent(At);
