namespace OpsLvp.Core.Engine;

/// <summary>Acknowledge a raised alarm by its key; the alarm stays until its cause ends.</summary>
public sealed record AcknowledgeAlarm(string Actor, string AlarmKey) : EngineCommand(Actor);
