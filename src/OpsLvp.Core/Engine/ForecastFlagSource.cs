using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Engine;

/// <summary>
/// What decides the forecast flag now (docs/engine.md R26, R27): either a forecast part (origin, station, the report
/// text, the group as written, the group's window and its short form) or a duty manager's manual setting
/// (<see cref="Actor"/> and <see cref="Reason"/>). <see cref="Since"/> is when this source started deciding.
/// </summary>
public sealed record ForecastFlagSource(
    bool On,
    ForecastOrigin? Origin,
    string? Station,
    string? ReportText,
    string? Group,
    DateTimeOffset? From,
    DateTimeOffset? Until,
    string? ShortForm,
    string? Actor,
    string? Reason,
    DateTimeOffset Since)
{
    /// <summary>Set by a duty manager, not by a forecast.</summary>
    public bool Manual => Actor is not null;

    /// <summary>The source of a flag a forecast part sets.</summary>
    public static ForecastFlagSource FromTrigger(ForecastTriggerSource source, DateTimeOffset since)
    {
        ArgumentNullException.ThrowIfNull(source);
        return new ForecastFlagSource(true, source.Origin, source.Station, source.ReportText, source.Group, source.From, source.Until,
            source.ShortForm, null, null, since);
    }

    /// <summary>The source of a flag a duty manager set or cleared.</summary>
    public static ForecastFlagSource FromManual(ManualForecast manual)
    {
        ArgumentNullException.ThrowIfNull(manual);
        return new ForecastFlagSource(manual.On, null, null, null, null, null, null, null, manual.Actor, manual.Reason, manual.At);
    }

    /// <summary>Same source apart from <see cref="Since"/>.</summary>
    public bool SameAs(ForecastFlagSource? other) => other is not null && this with { Since = other.Since } == other;
}
