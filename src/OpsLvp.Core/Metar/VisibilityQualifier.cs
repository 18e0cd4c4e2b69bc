namespace OpsLvp.Core.Metar;

/// <summary>A statute-mile visibility given as a limit (<c>M1/4SM</c> less than, <c>P6SM</c> more than; FAA FMH-1 — from memory).</summary>
public enum VisibilityQualifier
{
    /// <summary><c>M</c>: less than the value.</summary>
    LessThan,

    /// <summary><c>P</c>: more than the value.</summary>
    MoreThan,
}
