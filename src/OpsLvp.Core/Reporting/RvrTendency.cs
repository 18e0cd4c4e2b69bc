namespace OpsLvp.Core.Reporting;

/// <summary>RVR tendency over the 10-minute period, METAR suffix <c>U</c>/<c>D</c>/<c>N</c> (WMO-No. 306, FM 15; ICAO Annex 3
/// App 3 §4.3.6.6): the one tendency type, used by the METAR decoder and the tendency rule alike.</summary>
public enum RvrTendency
{
    /// <summary>No distinct change: <c>N</c>.</summary>
    NoChange,
    /// <summary>Upward: <c>U</c>.</summary>
    Up,
    /// <summary>Downward: <c>D</c>.</summary>
    Down,
}
