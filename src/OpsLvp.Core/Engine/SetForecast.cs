namespace OpsLvp.Core.Engine;

/// <summary>Set or clear the deterioration forecast flag (docs/engine.md R4, R9).</summary>
public sealed record SetForecast(string Actor, bool On, string Reason) : EngineCommand(Actor);
