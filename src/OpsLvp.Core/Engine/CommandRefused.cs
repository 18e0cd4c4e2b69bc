namespace OpsLvp.Core.Engine;

/// <summary>A command that could not apply, with a reason a person can read. The state is unchanged by it.</summary>
public sealed record CommandRefused(DateTimeOffset At, EngineCommand Command, string Reason) : EngineEvent(At);
