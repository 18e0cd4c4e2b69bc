namespace OpsLvp.Core.Metar;

/// <summary>The unit a visibility group was written in.</summary>
public enum VisibilityUnit
{
    /// <summary>Metres (<c>0400</c>, <c>9999</c>, CAVOK): WMO-No. 306 FM 15.</summary>
    Metres,

    /// <summary>Statute miles (<c>1/4SM</c>, <c>1 1/2SM</c>, <c>10SM</c>): North American practice (FAA FMH-1 — from memory).</summary>
    StatuteMiles,
}
