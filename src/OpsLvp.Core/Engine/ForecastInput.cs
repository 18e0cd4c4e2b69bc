using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Engine;

/// <summary>
/// A forecast as it arrives (docs/engine.md R25): a TAF (<see cref="Text"/> is the TAF) or the TREND of a METAR/SPECI
/// (<see cref="Text"/> is the whole report, whose observation time starts the trend). <see cref="ReceivedAt"/> places
/// the report's day and hour groups in time (docs/forecasts.md "Placing a forecast in time").
/// </summary>
public sealed record ForecastInput(ForecastOrigin Origin, string Text, DateTimeOffset ReceivedAt) : EngineInput;
