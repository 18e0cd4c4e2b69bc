namespace OpsLvp.Core.Metar;

/// <summary>RVR outside the assessment limits (WMO-No. 306 FM 15; ICAO Annex 3 App 3 §4.3.6).</summary>
public enum RvrQualifier
{
    /// <summary><c>M</c>: below the lowest value the system can assess (e.g. <c>M0050</c>).</summary>
    Below,
    /// <summary><c>P</c>: above the highest value the system can assess (e.g. <c>P2000</c>).</summary>
    Above,
}
