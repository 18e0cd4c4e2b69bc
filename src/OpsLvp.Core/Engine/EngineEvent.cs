namespace OpsLvp.Core.Engine;

/// <summary>Something the engine decided or recorded, stamped with the exact instant it happened (docs/engine.md R7, R12).</summary>
public abstract record EngineEvent(DateTimeOffset At);
