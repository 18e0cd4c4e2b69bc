namespace OpsLvp.Core.Reporting;

/// <summary>Obscuration by water droplets, as classified from visibility alone.</summary>
public enum Obscuration
{
    /// <summary>Visibility above 5000 m: neither fog nor mist.</summary>
    None,
    /// <summary>Mist, METAR <c>BR</c>: visibility from 1000 m to 5000 m inclusive.</summary>
    Mist,
    /// <summary>Fog, METAR <c>FG</c>: visibility below 1000 m.</summary>
    Fog,
}
