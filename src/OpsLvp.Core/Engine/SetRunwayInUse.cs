namespace OpsLvp.Core.Engine;

/// <summary>Change the direction in use of a runway (docs/engine.md R34); a reason is required. RVR positions and capability follow at once.</summary>
public sealed record SetRunwayInUse(string Actor, string RunwayId, string Direction, string Reason) : EngineCommand(Actor);
