namespace OpsLvp.Core.Engine;

/// <summary>Undo a tick; needs a reason (docs/engine.md R11).</summary>
public sealed record UntickItem(string Actor, string ItemId, string Reason) : EngineCommand(Actor);
