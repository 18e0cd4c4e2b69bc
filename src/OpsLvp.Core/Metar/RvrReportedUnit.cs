namespace OpsLvp.Core.Metar;

/// <summary>The unit an RVR group was reported in: metres, or feet when the group ends in <c>FT</c>.</summary>
public enum RvrReportedUnit
{
    Metres,
    Feet,
}
