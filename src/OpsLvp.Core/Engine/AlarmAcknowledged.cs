namespace OpsLvp.Core.Engine;

/// <summary>A duty manager acknowledged an alarm; it stays raised until its cause ends.</summary>
public sealed record AlarmAcknowledged(DateTimeOffset At, string Key, AlarmKind Kind, string Actor) : EngineEvent(At);
