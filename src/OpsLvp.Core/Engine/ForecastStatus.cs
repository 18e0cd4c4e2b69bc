namespace OpsLvp.Core.Engine;

/// <summary>
/// The forecast flag as displays show it (docs/engine.md R29): what decides it (<see cref="Source"/>), the manual
/// setting if any, whether the profile lets forecasts set it (<see cref="Automatic"/>), the forecasts held, and —
/// while forecasts do not set it — when the held ones next will (<see cref="NextOnAt"/>, with that part's short form
/// and window start).
/// </summary>
public sealed record ForecastStatus(
    ForecastFlagSource? Source,
    ManualForecast? Manual,
    bool Automatic,
    IReadOnlyList<HeldForecast> Held,
    DateTimeOffset? NextOnAt,
    string? NextOnShortForm,
    DateTimeOffset? NextOnWindowFrom);
