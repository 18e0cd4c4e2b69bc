namespace OpsLvp.Web.Feeds.Demo;

/// <summary>
/// A loaded demo scenario, rows sorted by offset. <see cref="Rejections"/> are the malformed reading rows
/// (index = data row, 0-based); <see cref="ActionErrors"/> the malformed action rows, as one-line messages.
/// </summary>
public sealed record Scenario(
    IReadOnlyList<ScenarioReading> Readings,
    IReadOnlyList<ScenarioAction> Actions,
    IReadOnlyList<ReadingRejection> Rejections,
    IReadOnlyList<string> ActionErrors)
{
    /// <summary>The absolute time offset zero stands for, when the readings use absolute times; else null.</summary>
    public DateTimeOffset? Origin { get; init; }

    /// <summary>Forecasts to send (a TAF, a METAR with TREND) at their offsets (docs/feeds.md "Demo forecasts"), sorted.</summary>
    public IReadOnlyList<(TimeSpan Offset, OpsLvp.Core.Engine.ForecastInput Forecast)> Forecasts { get; init; } = [];

    /// <summary>Offset of the last row (readings or actions).</summary>
    public TimeSpan Duration =>
        new[] { Readings.Count > 0 ? Readings[^1].Offset : TimeSpan.Zero, Actions.Count > 0 ? Actions[^1].Offset : TimeSpan.Zero }.Max();
}
