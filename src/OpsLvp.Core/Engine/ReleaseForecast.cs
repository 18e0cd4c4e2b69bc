namespace OpsLvp.Core.Engine;

/// <summary>Release a duty manager's manual forecast setting: the flag follows the forecasts again (docs/engine.md R27).</summary>
public sealed record ReleaseForecast(string Actor, string Reason) : EngineCommand(Actor);
