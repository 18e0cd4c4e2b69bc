using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Engine;

/// <summary>
/// A forecast the engine holds (docs/engine.md R25): its origin, station and text as received, when it was received,
/// and where it was placed in time. The engine decodes it again from <see cref="Text"/> and <see cref="ReceivedAt"/>
/// when it needs the parts, so the state stays plain JSON.
/// </summary>
public sealed record HeldForecast(
    ForecastOrigin Origin,
    string Station,
    string Text,
    DateTimeOffset ReceivedAt,
    DateTimeOffset IssuedAt,
    DateTimeOffset ValidFrom,
    DateTimeOffset ValidUntil);
