namespace OpsLvp.Core.Engine;

/// <summary>Normal was re-entered: the episode ended.</summary>
public sealed record EpisodeEnded(DateTimeOffset At, string EpisodeId, DateTimeOffset Start, Phase DeepestPhase) : EngineEvent(At);
