namespace OpsLvp.Core.Engine;

/// <summary>
/// The duty manager sets the runway-light intensity step in use by hand (docs/engine.md R20): 0 (lights off) or a
/// step the profile has an intensity for. A reason is required; the setting is audited.
/// </summary>
public sealed record SetLightStep(string Actor, int Step, string Reason) : EngineCommand(Actor);
