namespace OpsLvp.Core.Profile;

/// <summary>
/// Profile section <c>forecast</c>: when a TAF or TREND counts as forecasting deterioration (docs/forecasts.md). All
/// values are local choices; the demo's are illustrative. Checked by <see cref="ForecastSettingsValidator"/>.
/// </summary>
public sealed record ForecastSettings
{
    /// <summary>Look-ahead from now, minutes (&gt; 0, at most 1800 = the longest TAF validity of 30 h).</summary>
    public required int HorizonMinutes { get; init; }

    /// <summary>A forecast prevailing visibility below this (metres, strict) is deterioration; null: visibility is not judged.</summary>
    public double? VisibilityBelowM { get; init; }

    /// <summary>A forecast ceiling below this (feet, strict) is deterioration; null: ceiling is not judged.</summary>
    public double? CeilingBelowFt { get; init; }

    /// <summary>Whether <c>TEMPO</c> groups count (a <c>PROB30/40 TEMPO</c> group also needs its probability counted).</summary>
    public required bool CountTempo { get; init; }

    /// <summary>Whether <c>PROB30</c> groups count (alone, or before <c>TEMPO</c> together with <see cref="CountTempo"/>).</summary>
    public required bool CountProb30 { get; init; }

    /// <summary>Whether <c>PROB40</c> groups count (alone, or before <c>TEMPO</c> together with <see cref="CountTempo"/>).</summary>
    public required bool CountProb40 { get; init; }
}
