namespace OpsLvp.Core.Engine;

/// <summary>Confirm the pending transition (DESIGN R10); the reason is optional.</summary>
public sealed record ConfirmPending(string Actor, string? Reason = null) : EngineCommand(Actor);
