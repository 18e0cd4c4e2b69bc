namespace OpsLvp.Core.Engine;

/// <summary>A tick was undone, with the reason (docs/engine.md R11); the item is open again.</summary>
public sealed record ItemUnticked(DateTimeOffset At, string ItemId, string Actor, string Reason, ItemTick UndoneTick) : EngineEvent(At);
