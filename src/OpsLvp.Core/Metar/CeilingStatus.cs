namespace OpsLvp.Core.Metar;

/// <summary>What a report says about the ceiling (docs/metar.md; JSON <c>ceiling_status</c>).</summary>
public enum CeilingStatus
{
    /// <summary>
    /// The report positively states there is no ceiling: CAVOK, NSC, NCD, SKC, CLR, or only layers of known cover and
    /// height none of which is BKN/OVC below 20 000 ft.
    /// </summary>
    None,

    /// <summary>A ceiling is reported (a BKN/OVC base below 20 000 ft, or the vertical visibility) and nothing in the report could lie below it unseen.</summary>
    Reported,

    /// <summary>
    /// The ceiling cannot be told: sky obscured with the vertical visibility not determinable (<c>VV///</c>), a BKN or
    /// OVC layer whose height is not determinable (<c>BKN///</c>), cloud not observable (<c>//////</c>), no cloud
    /// group at all, or a NIL report. <see cref="MetarReport.Ceiling"/> may still hold the lowest known base; the
    /// ceiling may be lower.
    /// </summary>
    Unknown,
}
