using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Engine.Replay;

/// <summary>
/// Forecasts CSV (docs/replay.md "Forecasts"): header <c>time,origin,text</c>; <c>time</c> is when the forecast was
/// received, <c>origin</c> <c>taf</c> or <c>trend</c> (the text is then the whole METAR/SPECI whose TREND it is), the
/// text quoted per RFC 4180 when it holds commas. Syntax errors throw <see cref="FormatException"/> naming file and line;
/// a text that does not decode is the engine's to refuse (a <c>forecast_rejected</c> event).
/// </summary>
public static class ForecastsCsv
{
    public const string Header = "time,origin,text";

    public static IReadOnlyList<ForecastInput> Parse(string text, string fileName)
    {
        ArgumentNullException.ThrowIfNull(text);
        var forecasts = new List<ForecastInput>();
        foreach (var row in Csv.Rows(text, fileName, Header, 3))
        {
            var time = row.TimeAt(0);
            var origin = row.Fields[1].Trim() switch
            {
                "taf" => ForecastOrigin.Taf,
                "trend" => ForecastOrigin.Trend,
                var other => throw row.Error($"origin must be taf or trend, not '{other}'"),
            };
            var report = row.Fields[2].Trim();
            if (report.Length == 0)
            {
                throw row.Error("text is empty");
            }
            forecasts.Add(new ForecastInput(origin, report, time));
        }
        return forecasts;
    }
}
