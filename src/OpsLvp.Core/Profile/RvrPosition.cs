namespace OpsLvp.Core.Profile;

/// <summary>RVR assessment sites along a runway (ICAO Annex 3, App 3, §4.3.1).</summary>
public enum RvrPosition
{
    /// <summary>Touchdown zone, about 300 m from the threshold.</summary>
    Tdz,
    /// <summary>Mid-point, 1000–1500 m from the threshold.</summary>
    Mid,
    /// <summary>Stop end, about 300 m from the far end.</summary>
    End,
}
