namespace OpsLvp.Core.Capability;

/// <summary>A facility's reported status: who said so, when and why (kept in the engine state, docs/engine.md R30).</summary>
public sealed record FacilityState(FacilityStatus Status, string Reason, string By, DateTimeOffset Since);
