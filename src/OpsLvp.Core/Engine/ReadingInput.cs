using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>A sensor reading as it arrives; screened by the engine (docs/engine.md R1) before it can reach the state.</summary>
public sealed record ReadingInput(Reading Reading) : EngineInput;
