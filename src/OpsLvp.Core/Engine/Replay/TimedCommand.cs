namespace OpsLvp.Core.Engine.Replay;

/// <summary>A command with the instant it was given, as in an actions file.</summary>
public sealed record TimedCommand(DateTimeOffset Time, EngineCommand Command);
