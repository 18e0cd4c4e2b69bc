namespace OpsLvp.Core.Engine;

/// <summary>Something that happens to the engine at an evaluation instant: a reading or a command.</summary>
public abstract record EngineInput;
