using OpsLvp.Core.Metar;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// The LVP-relevant part of one TAF (WMO-No. 306 FM 51), as decoded by <see cref="TafDecoder"/>: station, issue time,
/// validity period, base forecast and every change group in order. Wind, temperature, icing, turbulence and wind shear
/// groups are recognised and skipped.
/// </summary>
public sealed record TafReport
{
    /// <summary>The report as decoded: upper-cased, groups separated by one space, without a trailing <c>=</c>.</summary>
    public required string Text { get; init; }

    public required string Station { get; init; }

    /// <summary>The issue time <c>YYGGggZ</c>.</summary>
    public required MetarObservationTime IssueTime { get; init; }

    /// <summary>The validity period <c>Y1Y1G1G1/Y2Y2G2G2</c> (<see cref="ForecastWindow.From"/> and <see cref="ForecastWindow.Until"/>); null only for NIL.</summary>
    public ForecastWindow? Validity { get; init; }

    /// <summary><c>AMD</c>: an amended forecast, replacing the one before it.</summary>
    public bool Amended { get; init; }

    /// <summary><c>COR</c>: a corrected forecast.</summary>
    public bool Corrected { get; init; }

    /// <summary><c>CNL</c>: the forecast for the period is cancelled; nothing is forecast.</summary>
    public bool Cancelled { get; init; }

    /// <summary><c>NIL</c>: no forecast; nothing else is decoded.</summary>
    public bool Nil { get; init; }

    /// <summary>The base forecast (the conditions before the first change group); empty for NIL and CNL.</summary>
    public ForecastConditions Base { get; init; } = new();

    public IReadOnlyList<ForecastChange> Changes { get; init; } = [];

    /// <summary>The remarks after RMK as written, or null.</summary>
    public string? Remarks { get; init; }

    /// <summary>Groups that match no known form; they are skipped.</summary>
    public IReadOnlyList<string> UnknownGroups { get; init; } = [];
}
