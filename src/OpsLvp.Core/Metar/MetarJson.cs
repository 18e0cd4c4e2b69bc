using System.Text.Json;
using OpsLvp.Core.Reporting;

namespace OpsLvp.Core.Metar;

/// <summary>
/// The JSON form of a decoded report, docs/cli.md; <c>station, visibility_m, cavok, rvr[], clouds[],
/// vertical_visibility_ft, ceiling_ft, weather[]</c> in that order, then extra fields (ceiling_status,
/// visibility_status, visibility_unit, visibility_qualifier, visibility_group, rvr_not_available, cloud_not_observable,
/// type, time, cor, auto, nil, min_visibility_m, min_visibility_direction, ndv, sky_obscured, sky_condition,
/// recent_weather, trend, remarks, unknown_groups); docs/metar.md. Codes are written as in the report (<c>"M"</c>,
/// <c>"U"</c>, <c>"BKN"</c>, <c>"CB"</c>).
/// </summary>
public static class MetarJson
{
    /// <summary>Writes <paramref name="report"/> as one JSON object (compact unless <paramref name="indented"/>).</summary>
    public static string Write(MetarReport report, bool indented = false)
    {
        ArgumentNullException.ThrowIfNull(report);
        return ReportJson.Build(indented, w => WriteReport(w, report));
    }

    private static void WriteReport(Utf8JsonWriter w, MetarReport r)
    {
        w.WriteStartObject();
        w.WriteString("station", r.Station);
        ReportJson.Number(w, "visibility_m", r.Visibility?.Value);
        w.WriteBoolean("cavok", r.Cavok);
        w.WriteStartArray("rvr");
        foreach (var rvr in r.Rvr)
        {
            w.WriteStartObject();
            w.WriteString("runway", rvr.Runway);
            ReportJson.Number(w, "value_m", rvr.Value?.Value);
            ReportJson.Number(w, "max_m", rvr.Max?.Value);
            w.WriteString("qualifier", ReportJson.Code(rvr.Qualifier));
            w.WriteString("tendency", rvr.Tendency switch
            {
                RvrTendency.Up => "U",
                RvrTendency.Down => "D",
                RvrTendency.NoChange => "N",
                _ => null,
            });
            w.WriteString("max_qualifier", ReportJson.Code(rvr.MaxQualifier));
            w.WriteString("unit", rvr.ReportedUnit == RvrReportedUnit.Feet ? "ft" : "m");
            ReportJson.Number(w, "reported_value", rvr.ReportedValue);
            ReportJson.Number(w, "reported_max", rvr.ReportedMax);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        ReportJson.Clouds(w, r.Clouds);
        ReportJson.Number(w, "vertical_visibility_ft", r.VerticalVisibility?.Value);
        ReportJson.Number(w, "ceiling_ft", r.Ceiling?.Value);
        ReportJson.Strings(w, "weather", r.Weather.Select(x => x.Code));
        w.WriteString("ceiling_status", r.CeilingStatus switch
        {
            CeilingStatus.None => "none",
            CeilingStatus.Reported => "reported",
            _ => "unknown",
        });
        w.WriteString("visibility_status", r.VisibilityStatus switch
        {
            VisibilityStatus.Reported => "reported",
            VisibilityStatus.NotObserved => "not_observed",
            VisibilityStatus.Unreadable => "unreadable",
            _ => "absent",
        });
        w.WriteString("visibility_unit", r.VisibilityStatus != VisibilityStatus.Reported ? null : r.VisibilityUnit == VisibilityUnit.StatuteMiles ? "SM" : "m");
        w.WriteString("visibility_qualifier", r.VisibilityQualifier switch
        {
            VisibilityQualifier.LessThan => "M",
            VisibilityQualifier.MoreThan => "P",
            _ => null,
        });
        w.WriteString("visibility_group", r.VisibilityGroup);
        w.WriteBoolean("rvr_not_available", r.RvrNotAvailable);
        w.WriteBoolean("cloud_not_observable", r.CloudNotObservable);
        w.WriteString("type", r.Type switch
        {
            MetarReportType.Metar => "METAR",
            MetarReportType.Speci => "SPECI",
            _ => null,
        });
        w.WriteString("time", r.Time.ToString());
        w.WriteBoolean("cor", r.Corrected);
        w.WriteBoolean("auto", r.Automatic);
        w.WriteBoolean("nil", r.Nil);
        ReportJson.Number(w, "min_visibility_m", r.MinimumVisibility?.Value.Value);
        w.WriteString("min_visibility_direction", r.MinimumVisibility?.Direction);
        w.WriteBoolean("ndv", r.NoDirectionalVariation);
        w.WriteBoolean("sky_obscured", r.SkyObscured);
        w.WriteString("sky_condition", r.SkyCondition);
        ReportJson.Strings(w, "recent_weather", r.RecentWeather.Select(x => x.Code));
        w.WriteString("trend", r.Trend);
        w.WriteString("remarks", r.Remarks);
        ReportJson.Strings(w, "unknown_groups", r.UnknownGroups);
        w.WriteEndObject();
    }
}
