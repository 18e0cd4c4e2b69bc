using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Engine;

/// <summary>
/// A forecast was accepted (docs/engine.md R25): origin, station, issue time and validity as placed, the text, and a
/// note when it ended a manual setting (R27).
/// </summary>
public sealed record ForecastReceived(
    DateTimeOffset At,
    ForecastOrigin Origin,
    string Station,
    DateTimeOffset IssuedAt,
    DateTimeOffset ValidFrom,
    DateTimeOffset ValidUntil,
    string Text,
    string? Note) : EngineEvent(At);
