namespace OpsLvp.Core.Engine;

/// <summary>
/// A duty manager marks an open checklist item not applicable, with a reason (docs/engine.md R13): it then counts as
/// done for safeguards and for the end of cancellation.
/// </summary>
public sealed record MarkNotApplicable(string Actor, string ItemId, string Reason) : EngineCommand(Actor);
