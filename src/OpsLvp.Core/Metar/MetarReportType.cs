namespace OpsLvp.Core.Metar;

/// <summary>The report type word that opens the message (WMO-No. 306, FM 15 METAR / FM 16 SPECI).</summary>
public enum MetarReportType
{
    /// <summary>Routine report, <c>METAR</c>.</summary>
    Metar,
    /// <summary>Special report, <c>SPECI</c>.</summary>
    Speci,
}
