using OpsLvp.Core.Reporting;
using System.Text;
using System.Text.Json;
using OpsLvp.Core.Metar;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// The JSON form of a decoded TAF (docs/forecasts.md): <c>station, type, issue_time, valid_from, valid_until, amd, cor,
/// cnl, nil, base, changes[], remarks, unknown_groups</c>. Each forecast (base or change) has <c>visibility_m,
/// visibility_qualifier, visibility_sm, cavok, weather[], nsw, clouds[], vertical_visibility_ft, sky_obscured,
/// sky_condition, ceiling_ft</c>; each change adds <c>indicator, kind, probability, from, until, at, text</c> before
/// them. Times are <c>DDHHMM</c> (<c>HHMM</c> in a TREND). Codes are written as in the report.
/// </summary>
public static class TafJson
{
    /// <summary>Writes <paramref name="report"/> as one JSON object (compact unless <paramref name="indented"/>).</summary>
    public static string Write(TafReport report, bool indented = false)
    {
        ArgumentNullException.ThrowIfNull(report);
        return Build(indented, w =>
        {
            w.WriteStartObject();
            w.WriteString("station", report.Station);
            w.WriteString("type", "TAF");
            w.WriteString("issue_time", report.IssueTime.ToString());
            w.WriteString("valid_from", report.Validity?.From?.ToString());
            w.WriteString("valid_until", report.Validity?.Until?.ToString());
            w.WriteBoolean("amd", report.Amended);
            w.WriteBoolean("cor", report.Corrected);
            w.WriteBoolean("cnl", report.Cancelled);
            w.WriteBoolean("nil", report.Nil);
            w.WriteStartObject("base");
            WriteConditions(w, report.Base);
            w.WriteEndObject();
            WriteChanges(w, report.Changes);
            w.WriteString("remarks", report.Remarks);
            Strings(w, "unknown_groups", report.UnknownGroups);
            w.WriteEndObject();
        });
    }

    /// <summary>Writes a decoded TREND as <c>{ "text", "changes": [...], "unknown_groups" }</c>, changes as in <see cref="Write(TafReport, bool)"/>.</summary>
    public static string Write(TrendForecast trend, bool indented = false)
    {
        ArgumentNullException.ThrowIfNull(trend);
        return Build(indented, w =>
        {
            w.WriteStartObject();
            w.WriteString("text", trend.Text);
            WriteChanges(w, trend.Changes);
            Strings(w, "unknown_groups", trend.UnknownGroups);
            w.WriteEndObject();
        });
    }

    private static string Build(bool indented, Action<Utf8JsonWriter> write)
    {
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = indented }))
        {
            write(w);
        }
        return Encoding.UTF8.GetString(stream.ToArray());
    }

    private static void WriteChanges(Utf8JsonWriter w, IReadOnlyList<ForecastChange> changes)
    {
        w.WriteStartArray("changes");
        foreach (var c in changes)
        {
            w.WriteStartObject();
            w.WriteString("indicator", c.Indicator);
            w.WriteString("kind", c.Kind switch
            {
                ForecastChangeKind.Becoming => "BECMG",
                ForecastChangeKind.Temporary => "TEMPO",
                ForecastChangeKind.From => "FM",
                ForecastChangeKind.Probability => "PROB",
                _ => "NOSIG",
            });
            Number(w, "probability", c.Probability);
            w.WriteString("from", c.Window.From?.ToString());
            w.WriteString("until", c.Window.Until?.ToString());
            w.WriteString("at", c.Window.At?.ToString());
            w.WriteString("text", c.Text);
            WriteConditions(w, c.Conditions);
            w.WriteEndObject();
        }
        w.WriteEndArray();
    }

    private static void WriteConditions(Utf8JsonWriter w, ForecastConditions c)
    {
        Number(w, "visibility_m", c.Visibility?.Distance.Value);
        w.WriteString("visibility_qualifier", c.Visibility?.Qualifier switch
        {
            RvrQualifier.Below => "M",
            RvrQualifier.Above => "P",
            _ => null,
        });
        Number(w, "visibility_sm", c.Visibility?.StatuteMiles);
        w.WriteBoolean("cavok", c.Cavok);
        Strings(w, "weather", c.Weather.Select(x => x.Code));
        w.WriteBoolean("nsw", c.NoSignificantWeather);
        w.WriteStartArray("clouds");
        foreach (var layer in c.Clouds)
        {
            w.WriteStartObject();
            w.WriteString("cover", layer.Cover switch
            {
                CloudCover.Few => "FEW",
                CloudCover.Scattered => "SCT",
                CloudCover.Broken => "BKN",
                CloudCover.Overcast => "OVC",
                _ => null,
            });
            Number(w, "base_ft", layer.Base?.Value);
            w.WriteString("type", layer.Type switch
            {
                CloudType.Cumulonimbus => "CB",
                CloudType.ToweringCumulus => "TCU",
                _ => null,
            });
            w.WriteEndObject();
        }
        w.WriteEndArray();
        Number(w, "vertical_visibility_ft", c.VerticalVisibility?.Value);
        w.WriteBoolean("sky_obscured", c.SkyObscured);
        w.WriteString("sky_condition", c.SkyCondition);
        Number(w, "ceiling_ft", c.FindCeiling(countVerticalVisibility: true)?.Value);
    }

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
