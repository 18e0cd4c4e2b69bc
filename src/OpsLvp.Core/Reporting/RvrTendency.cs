namespace OpsLvp.Core.Optics;

/// <summary>RVR tendency over the 10-minute period, METAR suffix <c>U</c>/<c>D</c>/<c>N</c> (WMO-No. 306, FM 15).</summary>
public enum RvrTendency
{
    /// <summary>No distinct change: <c>N</c>.</summary>
    NoChange,
    /// <summary>Upward: <c>U</c>.</summary>
    Up,
    /// <summary>Downward: <c>D</c>.</summary>
    Down,
}
