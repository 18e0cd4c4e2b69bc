namespace OpsLvp.Core.Engine;

/// <summary>An alarm was raised.</summary>
public sealed record AlarmRaised(DateTimeOffset At, Alarm Alarm) : EngineEvent(At);
