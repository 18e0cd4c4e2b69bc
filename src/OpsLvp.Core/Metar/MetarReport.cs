using OpsLvp.Core.Readings;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Metar;

/// <summary>
/// The LVP-relevant part of one METAR or SPECI (WMO-No. 306 FM 15/16), as decoded by <see cref="MetarDecoder"/>.
/// Everything from the first trend group (NOSIG, BECMG, TEMPO) or RMK on is kept only as text.
/// </summary>
public sealed record MetarReport
{
    /// <summary>Ceiling layers must lie below this height (ICAO/EASA definition of ceiling).</summary>
    public static readonly Feet CeilingLimit = new(20_000);

    /// <summary>Metres in one statute mile: 1609.344 exactly (the international mile).</summary>
    public const double MetresPerStatuteMile = 1609.344;

    /// <summary>
    /// RVR is reported when the visibility or the RVR is below this (1500 m; from memory, docs/sources.md "Runway visual range").
    /// A report whose visibility is at least this and that has no RVR group for a runway therefore says that runway's RVR
    /// was not required: 1500 m or more (docs/engine.md R22).
    /// </summary>
    public static readonly Metres RvrReportingVisibility = new(1500);

    /// <summary>Null when the text does not start with METAR or SPECI.</summary>
    public MetarReportType? Type { get; init; }

    public required string Station { get; init; }

    public required MetarObservationTime Time { get; init; }

    /// <summary>COR: a corrected report.</summary>
    public bool Corrected { get; init; }

    /// <summary>AUTO: fully automated report.</summary>
    public bool Automatic { get; init; }

    /// <summary>NIL: the report is missing; nothing else is decoded.</summary>
    public bool Nil { get; init; }

    /// <summary>
    /// Prevailing visibility; <c>9999</c> and CAVOK give 10 000 m ("10 km or more"); statute miles are converted at
    /// <see cref="MetresPerStatuteMile"/> and rounded down to the whole metre. Null if absent, <c>////</c> or unreadable:
    /// <see cref="VisibilityStatus"/> says which.
    /// </summary>
    public Metres? Visibility { get; init; }

    /// <summary>Whether the visibility was reported, not observed, unreadable or absent.</summary>
    public VisibilityStatus VisibilityStatus { get; init; } = VisibilityStatus.Absent;

    /// <summary>The unit the visibility group was written in.</summary>
    public VisibilityUnit VisibilityUnit { get; init; } = VisibilityUnit.Metres;

    /// <summary><c>M</c> (less than) or <c>P</c> (more than) before a statute-mile visibility; null otherwise.</summary>
    public VisibilityQualifier? VisibilityQualifier { get; init; }

    /// <summary>The visibility group as written (<c>0400</c>, <c>1 1/2SM</c>, <c>////</c>, or the unreadable group); null when absent.</summary>
    public string? VisibilityGroup { get; init; }

    public MetarMinimumVisibility? MinimumVisibility { get; init; }

    /// <summary>Visibility group flagged NDV (no directional variation can be given by the automatic system).</summary>
    public bool NoDirectionalVariation { get; init; }

    public bool Cavok { get; init; }

    public IReadOnlyList<MetarRvr> Rvr { get; init; } = [];

    /// <summary><c>RVRNO</c>: RVR should be reported but is not available (FAA FMH-1 — from memory).</summary>
    public bool RvrNotAvailable { get; init; }

    public IReadOnlyList<MetarWeather> Weather { get; init; } = [];

    /// <summary>Recent weather groups (<c>REFG</c> etc.), without the RE prefix.</summary>
    public IReadOnlyList<MetarWeather> RecentWeather { get; init; } = [];

    public IReadOnlyList<MetarCloudLayer> Clouds { get; init; } = [];

    /// <summary><c>//////</c> without CB/TCU: cloud not observable by the automatic system (no layer is listed for it).</summary>
    public bool CloudNotObservable { get; init; }

    /// <summary><c>VVnnn</c> in feet; null if absent or <c>VV///</c>.</summary>
    public Feet? VerticalVisibility { get; init; }

    /// <summary>True for <c>VVnnn</c> or <c>VV///</c>: the sky is obscured.</summary>
    public bool SkyObscured { get; init; }

    /// <summary><c>NSC</c>, <c>NCD</c>, <c>SKC</c> or <c>CLR</c> when one of them was reported, else null.</summary>
    public string? SkyCondition { get; init; }

    /// <summary>The trend part as written (from NOSIG, BECMG or TEMPO up to RMK), or null.</summary>
    public string? Trend { get; init; }

    /// <summary>The remarks after RMK as written, or null.</summary>
    public string? Remarks { get; init; }

    /// <summary>Groups of the decoded part that match no known form; they are skipped.</summary>
    public IReadOnlyList<string> UnknownGroups { get; init; } = [];

    /// <summary>The lowest BKN or OVC layer with a known base below <see cref="CeilingLimit"/>, or null.</summary>
    public MetarCloudLayer? CeilingLayer =>
        Clouds.Where(c => c.CoversMoreThanHalf && c.Base is { } b && b < CeilingLimit).MinBy(c => c.Base!.Value.Value);

    /// <summary>
    /// Ceiling: the base of <see cref="CeilingLayer"/>, or the vertical visibility, whichever is lower; null if neither
    /// (docs/cli.md). Counting vertical visibility is local practice; use <see cref="FindCeiling"/> to leave it out.
    /// </summary>
    public Feet? Ceiling => FindCeiling(countVerticalVisibility: true);

    /// <summary>Ceiling with or without vertical visibility counted (ICAO/EASA ceiling definition; VV is local practice).</summary>
    public Feet? FindCeiling(bool countVerticalVisibility)
    {
        var layer = CeilingLayer?.Base;
        var vv = countVerticalVisibility ? VerticalVisibility : null;
        if (layer is { } l && vv is { } v)
        {
            return l < v ? l : v;
        }
        return layer ?? vv;
    }

    /// <summary>
    /// True when the report positively states there is no ceiling: CAVOK, NSC/NCD/SKC/CLR, or cloud layers none of
    /// which can form one, and no vertical visibility.
    /// </summary>
    public bool StatesNoCeiling =>
        !Nil && !SkyObscured && Ceiling is null
        && (Cavok || SkyCondition is not null
            || (Clouds.Count > 0 && Clouds.All(c => c.Cover is not null && c.Base is not null)));

    /// <summary>
    /// Whether the report gives a ceiling, positively states there is none, or leaves it unknown. Unknown when the sky
    /// is obscured with <c>VV///</c>, cloud is not observable (<c>//////</c>), a layer that could form a ceiling has no
    /// height (<c>BKN///</c>) or an unknown cover below the reported ceiling (<c>///001</c>), when the report is NIL, or
    /// when it neither gives a ceiling nor states there is none (no cloud group).
    /// </summary>
    public CeilingStatus CeilingStatus
    {
        get
        {
            if (Nil)
            {
                return CeilingStatus.Unknown;
            }
            var ceiling = Ceiling;
            var hidden = (SkyObscured && VerticalVisibility is null) || CloudNotObservable
                || Clouds.Any(c => MayHideCeiling(c, ceiling));
            if (hidden)
            {
                return CeilingStatus.Unknown;
            }
            if (ceiling is not null)
            {
                return CeilingStatus.Reported;
            }
            return StatesNoCeiling ? CeilingStatus.None : CeilingStatus.Unknown;
        }
    }

    /// <summary>
    /// True when the report says RVR was not required (docs/engine.md R22): not NIL, no <c>RVRNO</c>, a visibility of
    /// at least <see cref="RvrReportingVisibility"/> not given as "less than", and no minimum visibility below it.
    /// </summary>
    public bool RvrNotRequired =>
        !Nil && !RvrNotAvailable
        && Visibility is { } v && v >= RvrReportingVisibility && VisibilityQualifier != Metar.VisibilityQualifier.LessThan
        && (MinimumVisibility is null || MinimumVisibility.Value >= RvrReportingVisibility);

    /// <summary>
    /// Readings for the server's METAR feed, all at <paramref name="observedAt"/> (resolve the day/time group with
    /// <see cref="MetarObservationTime.ResolveNear"/>): one <see cref="ReadingKind.Rvr"/> per mapped runway with a
    /// value (the minimum when varying; M0050 gives 50 m and P2000 gives 2000 m, the limits themselves), the prevailing
    /// visibility, the base of <see cref="CeilingLayer"/> as <see cref="ReadingKind.CloudBase"/>, and the vertical
    /// visibility. A NIL report gives none.
    /// <para>When <see cref="RvrNotRequired"/>, every mapped runway without an RVR group gets an RVR reading of
    /// 1500 m flagged <see cref="ReadingFlags.OrMore"/> ("RVR 1500 m or more", docs/engine.md R22), so recovery is not
    /// blocked forever when METAR is the only RVR source. When <see cref="CeilingStatus"/> is
    /// <see cref="Metar.CeilingStatus.Unknown"/>, no cloud-base or vertical-visibility reading is given at all: a known
    /// base above an unknown one must not satisfy recovery (docs/engine.md R24).</para>
    /// </summary>
    public IReadOnlyList<Reading> ToReadings(DateTimeOffset observedAt, MetarSensorMap map)
    {
        ArgumentNullException.ThrowIfNull(map);
        var readings = new List<Reading>();
        if (Nil)
        {
            return readings;
        }
        foreach (var rvr in Rvr)
        {
            if (rvr.Value is { } value && map.RvrSensorByRunway.TryGetValue(rvr.Runway, out var sensor))
            {
                readings.Add(new Reading(observedAt, sensor, ReadingKind.Rvr, value.Value));
            }
        }
        if (RvrNotRequired)
        {
            foreach (var (runway, sensor) in map.RvrSensorByRunway.OrderBy(p => p.Key, StringComparer.Ordinal))
            {
                if (!Rvr.Any(r => r.Runway == runway))
                {
                    readings.Add(new Reading(observedAt, sensor, ReadingKind.Rvr, RvrReportingVisibility.Value, Flags: ReadingFlags.OrMore));
                }
            }
        }
        if (Visibility is { } visibility && map.VisibilitySensorId is { } visibilitySensor)
        {
            readings.Add(new Reading(observedAt, visibilitySensor, ReadingKind.Visibility, visibility.Value));
        }
        if (CeilingStatus == CeilingStatus.Unknown)
        {
            return readings;
        }
        if (map.CloudBaseSensorId is { } cloudSensor)
        {
            if (CeilingLayer?.Base is { } cloudBase)
            {
                readings.Add(new Reading(observedAt, cloudSensor, ReadingKind.CloudBase, cloudBase.Value));
            }
            else if (map.NoCeilingCloudBaseFeet is { } clear && StatesNoCeiling)
            {
                readings.Add(new Reading(observedAt, cloudSensor, ReadingKind.CloudBase, clear));
            }
        }
        if (VerticalVisibility is { } vv && map.VerticalVisibilitySensorId is { } vvSensor)
        {
            readings.Add(new Reading(observedAt, vvSensor, ReadingKind.VerticalVisibility, vv.Value));
        }
        return readings;
    }

    /// <summary>A layer that could be a ceiling below <paramref name="ceiling"/> without the report saying so.</summary>
    private static bool MayHideCeiling(MetarCloudLayer layer, Feet? ceiling)
    {
        if (layer.Cover is { } && !layer.CoversMoreThanHalf)
        {
            return false;
        }
        if (layer.Base is not { } b)
        {
            return true;
        }
        // A known BKN/OVC base is in the ceiling already; a layer of unknown cover could be BKN/OVC.
        return layer.Cover is null && b < CeilingLimit && (ceiling is null || b < ceiling.Value);
    }
}
