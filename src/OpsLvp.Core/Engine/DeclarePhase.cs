namespace OpsLvp.Core.Engine;

/// <summary>
/// Declare preparation or active (docs/engine.md R9): enters that phase if the current one is lower and sets a hold.
/// Declaring active while safeguards are open is refused with the open items (R13) unless
/// <paramref name="SafeguardsOverride"/> gives the duty manager's reason for entering active anyway.
/// </summary>
public sealed record DeclarePhase(string Actor, Phase Phase, string Reason, string? SafeguardsOverride = null) : EngineCommand(Actor);
