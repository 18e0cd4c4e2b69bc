namespace OpsLvp.Core.Engine;

/// <summary>An alarm's cause ended; the alarm is gone.</summary>
public sealed record AlarmCleared(DateTimeOffset At, string Key, AlarmKind Kind) : EngineEvent(At);
