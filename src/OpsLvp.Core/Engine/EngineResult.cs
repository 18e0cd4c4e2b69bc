namespace OpsLvp.Core.Engine;

/// <summary>The outcome of one <see cref="LvpEngine.Evaluate"/>: the new state and the events, in time order.</summary>
public sealed record EngineResult(EngineState State, IReadOnlyList<EngineEvent> Events);
