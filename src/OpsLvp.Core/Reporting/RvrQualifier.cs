namespace OpsLvp.Core.Reporting;

/// <summary>Whether a reported RVR is a limit rather than a value (METAR prefix <c>M</c>/<c>P</c>, WMO-No. 306 FM 15).</summary>
public enum RvrQualifier
{
    /// <summary>The reported value is the assessed value rounded down to the reporting scale.</summary>
    None,
    /// <summary>The RVR is below the lower reporting limit (50 m): METAR <c>M0050</c>.</summary>
    Below,
    /// <summary>The RVR is above the upper reporting limit (2000 m): METAR <c>P2000</c>.</summary>
    Above,
}
