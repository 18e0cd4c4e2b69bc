namespace OpsLvp.Core.Forecast;

/// <summary>
/// The TREND of a METAR or SPECI (WMO-No. 306 FM 15), decoded by <see cref="TrendDecoder"/> into the same change-group
/// model as a TAF. <c>NOSIG</c> is one change of kind <see cref="ForecastChangeKind.NoSignificantChange"/>.
/// </summary>
public sealed record TrendForecast(string Text, IReadOnlyList<ForecastChange> Changes, IReadOnlyList<string> UnknownGroups)
{
    /// <summary>A TREND is valid for two hours from the time of the report (ICAO Annex 3, App 3 §2.2 — from memory).</summary>
    public static readonly TimeSpan ValidFor = TimeSpan.FromHours(2);
}
