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
        return ReportJson.Build(indented, w =>
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
            ReportJson.Strings(w, "unknown_groups", report.UnknownGroups);
            w.WriteEndObject();
        });
    }

    /// <summary>Writes a decoded TREND as <c>{ "text", "changes": [...], "unknown_groups" }</c>, changes as in <see cref="Write(TafReport, bool)"/>.</summary>
    public static string Write(TrendForecast trend, bool indented = false)
    {
        ArgumentNullException.ThrowIfNull(trend);
        return ReportJson.Build(indented, w =>
        {
            w.WriteStartObject();
            w.WriteString("text", trend.Text);
            WriteChanges(w, trend.Changes);
            ReportJson.Strings(w, "unknown_groups", trend.UnknownGroups);
            w.WriteEndObject();
        });
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
            ReportJson.Number(w, "probability", c.Probability);
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
        ReportJson.Number(w, "visibility_m", c.Visibility?.Distance.Value);
        w.WriteString("visibility_qualifier", ReportJson.Code(c.Visibility?.Qualifier));
        ReportJson.Number(w, "visibility_sm", c.Visibility?.StatuteMiles);
        w.WriteBoolean("cavok", c.Cavok);
        ReportJson.Strings(w, "weather", c.Weather.Select(x => x.Code));
        w.WriteBoolean("nsw", c.NoSignificantWeather);
        ReportJson.Clouds(w, c.Clouds);
        ReportJson.Number(w, "vertical_visibility_ft", c.VerticalVisibility?.Value);
        w.WriteBoolean("sky_obscured", c.SkyObscured);
        w.WriteString("sky_condition", c.SkyCondition);
        ReportJson.Number(w, "ceiling_ft", c.FindCeiling(countVerticalVisibility: true)?.Value);
    }
}
