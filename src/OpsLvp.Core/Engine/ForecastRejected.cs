using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Engine;

/// <summary>A forecast input was refused with a reason (docs/engine.md R25): not decodable, NIL, another station, already expired.</summary>
public sealed record ForecastRejected(DateTimeOffset At, ForecastOrigin Origin, string Text, string Reason) : EngineEvent(At);
