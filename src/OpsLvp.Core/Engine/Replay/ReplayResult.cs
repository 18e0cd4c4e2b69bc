namespace OpsLvp.Core.Engine.Replay;

/// <summary>Every event of a replay in order, and the state at its end.</summary>
public sealed record ReplayResult(IReadOnlyList<EngineEvent> Events, EngineState FinalState);
