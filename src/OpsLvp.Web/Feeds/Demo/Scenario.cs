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
    /// <summary>Offset of the last row (readings or actions).</summary>
    public TimeSpan Duration =>
        new[] { Readings.Count > 0 ? Readings[^1].Offset : TimeSpan.Zero, Actions.Count > 0 ? Actions[^1].Offset : TimeSpan.Zero }.Max();
}
