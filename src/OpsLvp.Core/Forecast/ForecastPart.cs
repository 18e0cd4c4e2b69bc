namespace OpsLvp.Core.Forecast;

/// <summary>
/// One stretch of a forecast with absolute times: the conditions forecast from <see cref="From"/> (inclusive) to
/// <see cref="Until"/> (exclusive). Prevailing parts (the base forecast, <c>BECMG</c>, <c>FM</c>) carry the elements in
/// force, earlier ones included; temporary and probability parts carry only what their group states.
/// </summary>
/// <param name="Change">The change group the part comes from; null for the base forecast.</param>
public sealed record ForecastPart(ForecastChange? Change, DateTimeOffset From, DateTimeOffset Until, ForecastConditions Conditions)
{
    /// <summary>The group as written, or <c>base forecast</c>.</summary>
    public string Group => Change?.Text ?? "base forecast";
}
