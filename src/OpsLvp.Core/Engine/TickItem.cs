namespace OpsLvp.Core.Engine;

/// <summary>Tick a checklist item as done for <paramref name="Team"/>, which must own it (docs/engine.md R11).</summary>
public sealed record TickItem(string Actor, string Team, string ItemId, string? Note = null) : EngineCommand(Actor);
