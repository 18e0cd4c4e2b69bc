namespace OpsLvp.Core.Metar;

/// <summary>
/// Which sensor ids the readings taken from a METAR get (<see cref="MetarReport.ToReadings"/>). RVR groups of
/// runways not in <see cref="RvrSensorByRunway"/> (keys as written in the report, e.g. <c>26L</c>) give no reading;
/// a null id gives no reading of that kind.
/// </summary>
/// <param name="RvrSensorByRunway">Sensor id per runway designator as written in the RVR group.</param>
/// <param name="VisibilitySensorId">Sensor id for the prevailing visibility.</param>
/// <param name="CloudBaseSensorId">Sensor id for the base of the ceiling layer.</param>
/// <param name="VerticalVisibilitySensorId">Sensor id for the vertical visibility.</param>
/// <param name="NoCeilingCloudBaseFeet">
/// When set, a report that positively states there is no ceiling (CAVOK, NSC, NCD, SKC, CLR, or only layers that
/// cannot form one) gives a cloud-base reading of this height, so that a ceiling fed only by METAR does not go stale
/// in good weather. Null (default) gives no reading in that case.
/// </param>
public sealed record MetarSensorMap(
    IReadOnlyDictionary<string, string> RvrSensorByRunway,
    string? VisibilitySensorId = null,
    string? CloudBaseSensorId = null,
    string? VerticalVisibilitySensorId = null,
    double? NoCeilingCloudBaseFeet = null);
