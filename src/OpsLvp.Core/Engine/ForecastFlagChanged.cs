namespace OpsLvp.Core.Engine;

/// <summary>
/// The forecast flag or what decides it changed (docs/engine.md R26–R28): on or off, set by hand or by a forecast,
/// the source's short form (null when off by forecasts), why, and the forecast group's window when a forecast sets it.
/// </summary>
public sealed record ForecastFlagChanged(DateTimeOffset At, bool On, bool Manual, string? Source, string Reason, DateTimeOffset? From = null, DateTimeOffset? Until = null) : EngineEvent(At);
