namespace OpsLvp.Core.Engine;

/// <summary>Mark a sensor out of or back in service (docs/engine.md R3, R9).</summary>
public sealed record SetSensorService(string Actor, string SensorId, bool InService, string Reason) : EngineCommand(Actor);
