using System.Text.Json.Nodes;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;

namespace OpsLvp.Web.Review;

/// <summary>
/// The ECharts option object (echarts 6, served from wwwroot-assets/vendor/echarts) for an episode timeline: RVR per
/// runway position and ceiling against time, thresholds in effect as lines, phase bands behind, transitions,
/// confirmations, manual actions and ticks as markers, data gaps and out-of-service sensors shaded, zoom and
/// hover values; with a what-if, the alternative transitions as dashed vertical lines beside the actual ones.
/// </summary>
public static class TimelineChartOptions
{
    /// <summary>Band colours per phase (translucent, behind the lines; dark theme).</summary>
    public static string BandColour(Phase phase) => phase switch
    {
        Phase.Preparation => "rgba(255, 193, 7, 0.12)",
        Phase.Active => "rgba(244, 67, 54, 0.16)",
        Phase.Cancellation => "rgba(33, 150, 243, 0.12)",
        _ => "rgba(0, 0, 0, 0)",
    };

    public static JsonObject Build(EpisodeExport export, WhatIfResult? whatIf = null)
    {
        ArgumentNullException.ThrowIfNull(export);
        var profile = export.Profile;
        var series = new JsonArray();
        var legend = new JsonArray();
        var gaps = new JsonArray();
        var rvrAge = TimeSpan.FromSeconds(profile.MaxAgeSeconds.TryGetValue(ReadingKind.Rvr, out var ra) ? ra : 120);
        var ceilingAge = TimeSpan.FromSeconds(profile.MaxAgeSeconds.TryGetValue(ReadingKind.CloudBase, out var ca) ? ca : 300);
        var ok = ReviewReadings.WithDerivedRvr(profile, export.Readings).Where(r => r.Status == ReadingStatus.Ok).ToList();
        foreach (var group in ok.Where(r => r.Kind == ReadingKind.Rvr).GroupBy(r => r.SensorId).OrderBy(g => g.Key, StringComparer.Ordinal))
        {
            var name = RvrName(profile, group.Key);
            legend.Add(name);
            series.Add(Line(name, group.ToList(), rvrAge, 0, gaps, dashed: false));
        }
        foreach (var group in ok.Where(r => EpisodeModel.IsCeiling(r.Kind)).GroupBy(r => r.SensorId).OrderBy(g => g.Key, StringComparer.Ordinal))
        {
            var name = $"Ceiling {group.Key} (ft)";
            legend.Add(name);
            series.Add(Line(name, group.ToList(), ceilingAge, 1, gaps, dashed: true));
        }
        var start = export.Readings.Count > 0 ? export.Readings.Min(r => r.Time) : export.Start;
        var end = export.ReplayUntil;
        var transitions = EpisodeModel.Transitions(export.Events);
        series.Add(Bands("Phase", EpisodeModel.Spans(transitions, start, end)));
        series.Add(Thresholds("RVR thresholds", profile.Thresholds, rvr: true, 0));
        series.Add(Thresholds("Ceiling thresholds", profile.Thresholds, rvr: false, 1));
        series.Add(Shading("Data gaps / out of service", gaps, OutOfService(export.Events, end)));
        var top = ok.Where(r => r.Kind == ReadingKind.Rvr).Select(r => r.Value).DefaultIfEmpty(2000).Max();
        series.Add(Markers("Transitions", "diamond", "#ffffff", top * 1.04, transitions.Select(t => (t.At, $"{Name(t.From)} → {Name(t.To)} ({t.By}{(t.Actor is null ? "" : ", " + t.Actor)}): {t.Reason}"))));
        series.Add(Markers("Confirmations", "triangle", "#80deea", top * 0.98, export.Events.Where(e => e.Name == "confirmation").Select(e => (e.At, $"confirmed {e.Str("to")} by {e.Str("actor")}"))));
        series.Add(Markers("Manual actions", "rect", "#ffab40", top * 0.92, export.Events.Where(e => e.Name == "manual_action").Select(e => (e.At, $"{e.Str("detail")} by {e.Str("actor")}: {e.Str("reason")}"))));
        series.Add(Markers("Ticks", "circle", "#a5d6a7", top * 0.86, export.Events.Where(e => e.Name == "item_ticked").Select(e => (e.At, $"{e.Str("item")} done by {e.Str("actor")} ({e.Str("team")})"))));
        series.Add(Markers("Forecasts", "pin", "#7fb2ff", top * 0.80, export.Events
            .Where(e => e.Name is EpisodeExport.ForecastReceivedName or "forecast_flag_changed")
            .Select(e => (e.At, e.Name == EpisodeExport.ForecastReceivedName
                ? $"{(e.Str("origin") == "trend" ? "TREND" : "TAF")} received: {e.Str("text")}"
                : $"forecast flag {(e.Json.Contains("\"on\":true", StringComparison.Ordinal) ? "on" : "off")} ({e.Str("by")}): {e.Str("source") ?? e.Str("reason")}"))));
        legend.Add("Transitions");
        legend.Add("Confirmations");
        legend.Add("Manual actions");
        legend.Add("Ticks");
        legend.Add("Forecasts");
        if (whatIf is not null)
        {
            series.Add(WhatIfLines(whatIf));
            legend.Add("What-if transitions");
        }
        return new JsonObject
        {
            ["animation"] = false,
            ["backgroundColor"] = "transparent",
            ["textStyle"] = new JsonObject { ["color"] = "#e0e0e0" },
            ["legend"] = new JsonObject { ["data"] = legend, ["textStyle"] = new JsonObject { ["color"] = "#e0e0e0" }, ["type"] = "scroll" },
            ["tooltip"] = new JsonObject { ["trigger"] = "axis", ["axisPointer"] = new JsonObject { ["type"] = "cross" } },
            ["grid"] = new JsonObject { ["left"] = 60, ["right"] = 60, ["top"] = 50, ["bottom"] = 70 },
            ["xAxis"] = new JsonObject { ["type"] = "time", ["min"] = Ms(start), ["max"] = Ms(end) },
            ["yAxis"] = new JsonArray
            {
                new JsonObject { ["type"] = "value", ["name"] = "RVR (m)", ["min"] = 0 },
                new JsonObject { ["type"] = "value", ["name"] = "Ceiling (ft)", ["min"] = 0, ["splitLine"] = new JsonObject { ["show"] = false } },
            },
            ["dataZoom"] = new JsonArray
            {
                new JsonObject { ["type"] = "inside", ["xAxisIndex"] = 0 },
                new JsonObject { ["type"] = "slider", ["xAxisIndex"] = 0, ["bottom"] = 10 },
            },
            ["series"] = series,
        };
    }

    /// <summary>"07 TDZ RVR07T" from the profile's sites; the sensor id alone when it has none.</summary>
    public static string RvrName(AerodromeProfile profile, string sensorId)
    {
        ArgumentNullException.ThrowIfNull(profile);
        var sites = profile.Sensors.FirstOrDefault(s => s.Id == sensorId)?.Sites;
        if (sites is null || sites.Count == 0)
        {
            return $"RVR {sensorId}";
        }
        var first = sites.OrderBy(s => s.Key, StringComparer.Ordinal).First();
        return $"RVR {first.Key} {first.Value.ToString().ToUpperInvariant()} ({sensorId})";
    }

    private static JsonObject Line(string name, List<Reading> readings, TimeSpan maxAge, int axis, JsonArray gaps, bool dashed)
    {
        var data = new JsonArray();
        Reading? previous = null;
        foreach (var r in readings.OrderBy(r => r.Time))
        {
            if (previous is not null && r.Time - previous.Time > maxAge)
            {
                data.Add(new JsonArray(Ms(previous.Time.AddMilliseconds(1)), null));
                gaps.Add(Area(previous.Time, r.Time, $"no data from {r.SensorId}"));
            }
            data.Add(new JsonArray(Ms(r.Time), r.Value));
            previous = r;
        }
        return new JsonObject
        {
            ["name"] = name,
            ["type"] = "line",
            ["yAxisIndex"] = axis,
            ["showSymbol"] = false,
            ["connectNulls"] = false,
            ["lineStyle"] = new JsonObject { ["width"] = 1.5, ["type"] = dashed ? "dashed" : "solid" },
            ["data"] = data,
        };
    }

    private static JsonObject Bands(string name, IEnumerable<PhaseSpan> spans)
    {
        var areas = new JsonArray();
        foreach (var s in spans.Where(s => s.Phase != Phase.Normal))
        {
            areas.Add(new JsonArray(
                new JsonObject { ["name"] = Name(s.Phase), ["xAxis"] = Ms(s.From), ["itemStyle"] = new JsonObject { ["color"] = BandColour(s.Phase) } },
                new JsonObject { ["xAxis"] = Ms(s.To) }));
        }
        return new JsonObject
        {
            ["name"] = name,
            ["type"] = "line",
            ["data"] = new JsonArray(),
            ["silent"] = true,
            ["markArea"] = new JsonObject { ["silent"] = true, ["label"] = new JsonObject { ["color"] = "#bdbdbd", ["position"] = "insideTop" }, ["data"] = areas },
        };
    }

    private static JsonObject Thresholds(string name, ThresholdSet t, bool rvr, int axis)
    {
        var lines = new JsonArray();
        void Add(double? value, string label, string colour, bool dashed)
        {
            if (value is { } v)
            {
                lines.Add(new JsonObject
                {
                    ["yAxis"] = v,
                    ["name"] = label,
                    ["lineStyle"] = new JsonObject { ["color"] = colour, ["type"] = dashed ? "dotted" : "solid" },
                    ["label"] = new JsonObject { ["formatter"] = $"{label} {v:0.#}", ["color"] = colour, ["position"] = axis == 0 ? "insideStartTop" : "insideEndTop" },
                });
            }
        }
        if (rvr)
        {
            Add(t.Preparation.RvrBelowM, "prep RVR <", "#ffc107", false);
            Add(t.Preparation.RvrRecoverM, "prep RVR recover ≥", "#ffc107", true);
            Add(t.Active.RvrBelowM, "active RVR <", "#f44336", false);
            Add(t.Active.RvrRecoverM, "active RVR recover ≥", "#f44336", true);
        }
        else
        {
            Add(t.Preparation.CeilingBelowFt, "prep ceiling <", "#ffe082", false);
            Add(t.Active.CeilingBelowFt, "active ceiling <", "#ef9a9a", false);
        }
        return new JsonObject
        {
            ["name"] = name,
            ["type"] = "line",
            ["yAxisIndex"] = axis,
            ["data"] = new JsonArray(),
            ["markLine"] = new JsonObject { ["silent"] = true, ["symbol"] = "none", ["data"] = lines },
        };
    }

    private static IEnumerable<JsonArray> OutOfService(IReadOnlyList<RecordedEvent> events, DateTimeOffset end)
    {
        var open = new Dictionary<string, DateTimeOffset>(StringComparer.Ordinal);
        foreach (var e in events.Where(e => e.Name == "manual_action"))
        {
            var detail = e.Str("detail") ?? "";
            var sensor = detail.StartsWith("sensor ", StringComparison.Ordinal) ? detail[7..].Split(' ')[0] : null;
            if (sensor is null)
            {
                continue;
            }
            if (e.Str("action") == "sensor_out")
            {
                open.TryAdd(sensor, e.At);
            }
            else if (e.Str("action") == "sensor_in" && open.Remove(sensor, out var from))
            {
                yield return Area(from, e.At, $"{sensor} out of service");
            }
        }
        foreach (var (sensor, from) in open)
        {
            yield return Area(from, end, $"{sensor} out of service");
        }
    }

    private static JsonObject Shading(string name, JsonArray gaps, IEnumerable<JsonArray> outOfService)
    {
        foreach (var a in outOfService)
        {
            gaps.Add(a);
        }
        return new JsonObject
        {
            ["name"] = name,
            ["type"] = "line",
            ["data"] = new JsonArray(),
            ["markArea"] = new JsonObject
            {
                ["itemStyle"] = new JsonObject { ["color"] = "rgba(158, 158, 158, 0.22)" },
                ["label"] = new JsonObject { ["show"] = false },
                ["data"] = gaps,
            },
        };
    }

    private static JsonArray Area(DateTimeOffset from, DateTimeOffset to, string label) =>
        new(new JsonObject { ["name"] = label, ["xAxis"] = Ms(from) }, new JsonObject { ["xAxis"] = Ms(to) });

    private static JsonObject Markers(string name, string symbol, string colour, double y, IEnumerable<(DateTimeOffset At, string Text)> points)
    {
        var data = new JsonArray();
        foreach (var (at, text) in points)
        {
            data.Add(new JsonObject { ["name"] = text, ["value"] = new JsonArray(Ms(at), Math.Round(y)) });
        }
        return new JsonObject
        {
            ["name"] = name,
            ["type"] = "scatter",
            ["symbol"] = symbol,
            ["symbolSize"] = 10,
            ["itemStyle"] = new JsonObject { ["color"] = colour },
            ["tooltip"] = new JsonObject { ["trigger"] = "item", ["formatter"] = "{b}" },
            ["data"] = data,
        };
    }

    private static JsonObject WhatIfLines(WhatIfResult whatIf)
    {
        var lines = new JsonArray();
        foreach (var t in whatIf.Alternative)
        {
            lines.Add(new JsonObject
            {
                ["xAxis"] = Ms(t.At),
                ["name"] = $"what-if {Name(t.From)} → {Name(t.To)}",
                ["label"] = new JsonObject { ["formatter"] = $"what-if → {Name(t.To)}", ["color"] = "#ce93d8", ["position"] = "insideEndTop" },
            });
        }
        return new JsonObject
        {
            ["name"] = "What-if transitions",
            ["type"] = "line",
            ["data"] = new JsonArray(),
            ["itemStyle"] = new JsonObject { ["color"] = "#ce93d8" },
            ["markLine"] = new JsonObject
            {
                ["symbol"] = "none",
                ["lineStyle"] = new JsonObject { ["color"] = "#ce93d8", ["type"] = "dashed", ["width"] = 2 },
                ["data"] = lines,
            },
        };
    }

    private static long Ms(DateTimeOffset t) => t.ToUnixTimeMilliseconds();

    private static string Name(Phase p) => p.ToString().ToLowerInvariant();
}
