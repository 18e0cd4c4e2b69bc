namespace OpsLvp.Core.Forecast;

/// <summary>Where a forecast comes from.</summary>
public enum ForecastOrigin
{
    /// <summary>A TAF (WMO-No. 306 FM 51).</summary>
    Taf,
    /// <summary>The TREND of a METAR or SPECI (WMO-No. 306 FM 15).</summary>
    Trend,
}
