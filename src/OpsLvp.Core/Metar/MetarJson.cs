using System.Text;
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
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = indented }))
        {
            WriteReport(w, report);
        }
        return Encoding.UTF8.GetString(stream.ToArray());
    }

    private static void WriteReport(Utf8JsonWriter w, MetarReport r)
    {
        w.WriteStartObject();
        w.WriteString("station", r.Station);
        Number(w, "visibility_m", r.Visibility?.Value);
        w.WriteBoolean("cavok", r.Cavok);
        w.WriteStartArray("rvr");
        foreach (var rvr in r.Rvr)
        {
            w.WriteStartObject();
            w.WriteString("runway", rvr.Runway);
            Number(w, "value_m", rvr.Value?.Value);
            Number(w, "max_m", rvr.Max?.Value);
            w.WriteString("qualifier", Code(rvr.Qualifier));
            w.WriteString("tendency", rvr.Tendency switch
            {
                RvrTendency.Up => "U",
                RvrTendency.Down => "D",
                RvrTendency.NoChange => "N",
                _ => null,
            });
            w.WriteString("max_qualifier", Code(rvr.MaxQualifier));
            w.WriteString("unit", rvr.ReportedUnit == RvrReportedUnit.Feet ? "ft" : "m");
            Number(w, "reported_value", rvr.ReportedValue);
            Number(w, "reported_max", rvr.ReportedMax);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteStartArray("clouds");
        foreach (var c in r.Clouds)
        {
            w.WriteStartObject();
            w.WriteString("cover", c.Cover switch
            {
                CloudCover.Few => "FEW",
                CloudCover.Scattered => "SCT",
                CloudCover.Broken => "BKN",
                CloudCover.Overcast => "OVC",
                _ => null,
            });
            Number(w, "base_ft", c.Base?.Value);
            w.WriteString("type", c.Type switch
            {
                CloudType.Cumulonimbus => "CB",
                CloudType.ToweringCumulus => "TCU",
                _ => null,
            });
            w.WriteEndObject();
        }
        w.WriteEndArray();
        Number(w, "vertical_visibility_ft", r.VerticalVisibility?.Value);
        Number(w, "ceiling_ft", r.Ceiling?.Value);
        Strings(w, "weather", r.Weather.Select(x => x.Code));
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
        Number(w, "min_visibility_m", r.MinimumVisibility?.Value.Value);
        w.WriteString("min_visibility_direction", r.MinimumVisibility?.Direction);
        w.WriteBoolean("ndv", r.NoDirectionalVariation);
        w.WriteBoolean("sky_obscured", r.SkyObscured);
        w.WriteString("sky_condition", r.SkyCondition);
        Strings(w, "recent_weather", r.RecentWeather.Select(x => x.Code));
        w.WriteString("trend", r.Trend);
        w.WriteString("remarks", r.Remarks);
        Strings(w, "unknown_groups", r.UnknownGroups);
        w.WriteEndObject();
    }

    private static string? Code(RvrQualifier q) => q switch
    {
        RvrQualifier.Below => "M",
        RvrQualifier.Above => "P",
        _ => null,
    };

    private static void Number(Utf8JsonWriter w, string name, double? value)
    {
        if (value is { } v)
        {
            w.WriteNumber(name, v);
        }
        else
        {
            w.WriteNull(name);
        }
    }

    private static void Strings(Utf8JsonWriter w, string name, IEnumerable<string> values)
    {
        w.WriteStartArray(name);
        foreach (var v in values)
        {
            w.WriteStringValue(v);
        }
        w.WriteEndArray();
    }
}
