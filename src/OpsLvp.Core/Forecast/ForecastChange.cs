namespace OpsLvp.Core.Forecast;

/// <summary>
/// One change group of a TAF or TREND: its indicator, probability (30 or 40 for <c>PROB30</c>/<c>PROB40</c>, alone or
/// before <c>TEMPO</c>; else null), time window, the elements it states, and its text as written.
/// </summary>
public sealed record ForecastChange(
    ForecastChangeKind Kind,
    int? Probability,
    ForecastWindow Window,
    ForecastConditions Conditions,
    string Text)
{
    /// <summary>The indicator as written: <c>BECMG</c>, <c>TEMPO</c>, <c>PROB30 TEMPO</c>, <c>FM</c>, <c>PROB40</c>, <c>NOSIG</c>.</summary>
    public string Indicator => Kind switch
    {
        ForecastChangeKind.Becoming => "BECMG",
        ForecastChangeKind.Temporary => Probability is { } p ? $"PROB{p} TEMPO" : "TEMPO",
        ForecastChangeKind.From => "FM",
        ForecastChangeKind.Probability => $"PROB{Probability}",
        _ => "NOSIG",
    };
}
