namespace OpsLvp.Core.Engine;

/// <summary>A checklist item was ticked done (docs/engine.md R11).</summary>
public sealed record ItemTicked(DateTimeOffset At, string ItemId, ItemTick Tick) : EngineEvent(At);
