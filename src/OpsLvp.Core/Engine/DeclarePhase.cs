namespace OpsLvp.Core.Engine;

/// <summary>Declare preparation or active (DESIGN R9): enters that phase if the current one is lower and sets a hold.</summary>
public sealed record DeclarePhase(string Actor, Phase Phase, string Reason) : EngineCommand(Actor);
