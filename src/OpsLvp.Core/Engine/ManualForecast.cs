namespace OpsLvp.Core.Engine;

/// <summary>The forecast flag as a duty manager set or cleared it by hand (docs/engine.md R27), until released or a newer forecast arrives.</summary>
public sealed record ManualForecast(bool On, string Actor, string Reason, DateTimeOffset At);
