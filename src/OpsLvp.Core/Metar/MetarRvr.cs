using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Metar;

/// <summary>
/// One RVR group <c>Rdd[L|C|R]/[M|P]nnnn[V[M|P]nnnn][FT][U|D|N]</c> (WMO-No. 306 FM 15; ICAO Annex 3 App 3 §4.3.6).
/// <see cref="Value"/> is the RVR, or the one-minute minimum when the group varies; <see cref="Max"/> is set only
/// for a varying group. Values reported in feet are converted to metres and rounded down to the whole metre
/// (the conservative direction, as Annex 3 rounds reported RVR down); <see cref="ReportedValue"/> and
/// <see cref="ReportedMax"/> keep the numbers as written in <see cref="ReportedUnit"/>. A missing group
/// (<c>R09/////</c>) has <see cref="Value"/> null. <see cref="Qualifier"/> and <see cref="MaxQualifier"/> are
/// <see cref="RvrQualifier.None"/> when the group carries no <c>M</c>/<c>P</c> (or has no maximum).
/// </summary>
public sealed record MetarRvr(
    string Runway,
    Metres? Value,
    Metres? Max,
    RvrQualifier Qualifier,
    RvrQualifier MaxQualifier,
    RvrTendency? Tendency,
    RvrReportedUnit ReportedUnit,
    int? ReportedValue,
    int? ReportedMax)
{
    /// <summary>True for <c>Rdd/////</c>: the runway's RVR is not available.</summary>
    public bool IsMissing => Value is null;
}
