namespace OpsLvp.Core.Metar;

/// <summary>RVR tendency over the 10-minute period (WMO-No. 306 FM 15; ICAO Annex 3 App 3 §4.3.6.6).</summary>
public enum RvrTendency
{
    /// <summary><c>U</c>: upward.</summary>
    Up,
    /// <summary><c>D</c>: downward.</summary>
    Down,
    /// <summary><c>N</c>: no distinct change.</summary>
    NoChange,
}
