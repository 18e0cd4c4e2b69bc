namespace OpsLvp.Core.Engine;

/// <summary>Cancel (docs/engine.md R9): active → cancellation, preparation → normal, even against the conditions.</summary>
public sealed record CancelLvp(string Actor, string Reason) : EngineCommand(Actor);
