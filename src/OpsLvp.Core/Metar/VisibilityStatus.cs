namespace OpsLvp.Core.Metar;

/// <summary>What became of a report's prevailing-visibility group (docs/metar.md; JSON <c>visibility_status</c>).</summary>
public enum VisibilityStatus
{
    /// <summary>A visibility was decoded (metres, statute miles or CAVOK).</summary>
    Reported,

    /// <summary><c>////</c>: visibility not observed (automatic system).</summary>
    NotObserved,

    /// <summary>
    /// A group stands where the visibility belongs (after the wind, before any RVR, weather or cloud group) but is in
    /// no known form; it is named in <see cref="MetarReport.VisibilityGroup"/> and listed in
    /// <see cref="MetarReport.UnknownGroups"/>.
    /// </summary>
    Unreadable,

    /// <summary>The report has no visibility group at all.</summary>
    Absent,
}
