namespace OpsLvp.Core.Engine;

/// <summary>Normal was left: an episode began.</summary>
public sealed record EpisodeStarted(DateTimeOffset At, string EpisodeId) : EngineEvent(At);
