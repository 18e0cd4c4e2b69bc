namespace OpsLvp.Core.Engine;

/// <summary>Confirm the pending transition (docs/engine.md R10); the reason is optional.</summary>
public sealed record ConfirmPending(string Actor, string? Reason = null) : EngineCommand(Actor);
