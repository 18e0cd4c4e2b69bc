namespace OpsLvp.Core.Engine;

/// <summary>Cancel (DESIGN R9): active → cancellation, preparation → normal, even against the conditions.</summary>
public sealed record CancelLvp(string Actor, string Reason) : EngineCommand(Actor);
