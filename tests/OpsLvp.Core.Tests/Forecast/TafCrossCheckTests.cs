using System.Globalization;
using System.Text.Json.Nodes;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Metar;
using OpsLvp.Core.Tests.Metar;
using Xunit.Abstractions;

namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// Independent cross-check of <see cref="TafDecoder"/>: every corpus forecast is decoded by the npm package
/// metar-taf-parser 9.1.3 (parseTAF) through Node.js, and station, validity, AMD/COR/CNL, the base forecast and every
/// change group (kind, probability, window, visibility, CAVOK, weather, cloud, vertical visibility) are compared. A
/// disagreement must be explained by a named rule of <see cref="TafKnownDifferences"/>; any other fails the test.
/// </summary>
public sealed class TafCrossCheckTests(ITestOutputHelper output)
{
    private readonly ITestOutputHelper _output = output;

    [NodeFact]
    public void Corpus_AgreesWithNpmMetarTafParser_OrEveryDifferenceIsExplained()
    {
        Assert.True(NodeTool.IsAvailable,
            "Node.js (node and npm on PATH) is required for the TAF cross-check when CI=true or OPSLVP_REQUIRE_BROWSER=1, but was not found");
        var npm = RunNpmDecoder();
        var corpus = TafCorpus.Load();
        Assert.True(corpus.Count(e => !e.MustRefuse) >= 100, "the TAF corpus must hold at least 100 forecasts (issue 15)");
        var unexplained = new List<string>();
        var fired = new Dictionary<string, int>(StringComparer.Ordinal);
        var fullyAgreeing = 0;

        foreach (var entry in corpus)
        {
            Assert.True(npm.TryGetValue(entry.Line, out var theirs), $"npm script gave no result for corpus line {entry.Line}");
            if (!TafDecoder.TryDecode(entry.Text, out var report, out var error))
            {
                if (entry.MustRefuse)
                {
                    Count(fired, TafKnownDifferences.WeRefuseTextThatIsNotATaf);
                }
                else
                {
                    unexplained.Add($"line {entry.Line}: we refuse ({error}) but the corpus expects a decode: {entry.Text}");
                }
                continue;
            }
            if (entry.MustRefuse)
            {
                unexplained.Add($"line {entry.Line}: the corpus expects a refusal but we decode: {entry.Text}");
                continue;
            }
            if (theirs["upper"] is JsonObject upper)
            {
                Count(fired, TafKnownDifferences.NpmDoesNotFoldCase);
                theirs = upper;
            }
            if (report!.Nil && theirs["ok"]!.GetValue<bool>() is false)
            {
                Count(fired, TafKnownDifferences.NpmFailsOnNil);
                continue;
            }
            if (theirs["ok"]!.GetValue<bool>() is false)
            {
                unexplained.Add($"line {entry.Line}: npm refuses ({theirs["error"]}) but we decode: {entry.Text}");
                continue;
            }

            var ours = Project(report);
            var npmProjection = ProjectNpm(theirs["taf"]!.AsObject());
            if (Same(ours, npmProjection))
            {
                fullyAgreeing++;
                continue;
            }
            var modelled = ours.DeepClone().AsObject();
            var used = new List<string>();
            foreach (var rule in TafKnownDifferences.All)
            {
                var before = modelled.ToJsonString();
                rule.ModelNpm(modelled, report);
                if (modelled.ToJsonString() != before)
                {
                    used.Add(rule.Name);
                }
            }
            if (Same(modelled, npmProjection))
            {
                used.ForEach(u => Count(fired, u));
            }
            else
            {
                unexplained.Add($"line {entry.Line}: (after rules [{string.Join(", ", used)}]){Environment.NewLine}  ours {modelled.ToJsonString()}"
                    + $"{Environment.NewLine}  npm  {npmProjection.ToJsonString()}{Environment.NewLine}  text {entry.Text}");
            }
        }

        _output.WriteLine($"forecasts agreeing on every compared field without any rule: {fullyAgreeing}");
        foreach (var (rule, count) in fired.OrderBy(p => p.Key, StringComparer.Ordinal))
        {
            _output.WriteLine($"explained by {rule}: {count}");
        }
        Assert.True(unexplained.Count == 0,
            $"{unexplained.Count} unexplained disagreement(s) with metar-taf-parser:{Environment.NewLine}{string.Join(Environment.NewLine, unexplained)}");
        // The comparison must have had something to compare: most of the corpus agrees outright.
        Assert.True(fullyAgreeing >= 50, $"only {fullyAgreeing} forecasts agree outright; the comparison looks broken");
    }

    private static Dictionary<int, JsonObject> RunNpmDecoder()
    {
        var dir = Path.Combine(AppContext.BaseDirectory, "Forecast", "node");
        if (!File.Exists(Path.Combine(dir, "node_modules", "metar-taf-parser", "package.json")))
        {
            var (code, stdout, stderr) = NodeTool.Run(NodeTool.Npm, dir, TimeSpan.FromMinutes(5), "ci", "--no-audit", "--no-fund");
            Assert.True(code == 0, $"npm ci failed in {dir} (exit {code}): {stderr}{stdout}");
        }
        var run = NodeTool.Run("node", dir, TimeSpan.FromMinutes(2), "decode-taf-corpus.mjs", TafCorpus.FilePath);
        Assert.True(run.ExitCode == 0, $"node decode-taf-corpus.mjs failed (exit {run.ExitCode}): {run.Stderr}");
        return run.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries)
            .Select(l => JsonNode.Parse(l)!.AsObject())
            .ToDictionary(o => o["line"]!.GetValue<int>());
    }

    /// <summary>Our decode in the compared shape. Times as DDHHMM; visibility in metres rounded to the millimetre.</summary>
    internal static JsonObject Project(TafReport r)
    {
        var changes = new JsonArray();
        foreach (var c in r.Changes)
        {
            var o = new JsonObject
            {
                ["kind"] = c.Kind switch
                {
                    ForecastChangeKind.Becoming => "BECMG",
                    ForecastChangeKind.Temporary => "TEMPO",
                    ForecastChangeKind.From => "FM",
                    _ => "PROB",
                },
                ["probability"] = c.Probability,
                ["from"] = c.Window.From?.ToString(),
                ["until"] = c.Window.Until?.ToString(),
            };
            Conditions(o, c.Conditions);
            changes.Add(o);
        }
        var baseForecast = new JsonObject();
        Conditions(baseForecast, r.Base);
        return new JsonObject
        {
            ["station"] = r.Station,
            ["valid_from"] = r.Validity?.From?.ToString(),
            ["valid_until"] = r.Validity?.Until?.ToString(),
            ["amd"] = r.Amended,
            ["cor"] = r.Corrected,
            ["cnl"] = r.Cancelled,
            ["base"] = baseForecast,
            ["changes"] = changes,
        };
    }

    private static void Conditions(JsonObject o, ForecastConditions c)
    {
        o["visibility_m"] = c.Visibility is { } v ? Math.Round(v.Distance.Value, 3) : null;
        o["cavok"] = c.Cavok;
        o["weather"] = new JsonArray(c.Weather.Select(w => (JsonNode?)JsonValue.Create(w.Code)).ToArray());
        o["clouds"] = new JsonArray(c.Clouds.Select(l => (JsonNode?)new JsonObject
        {
            ["cover"] = l.Cover switch
            {
                CloudCover.Few => "FEW",
                CloudCover.Scattered => "SCT",
                CloudCover.Broken => "BKN",
                CloudCover.Overcast => "OVC",
                _ => null,
            },
            ["base_ft"] = l.Base?.Value,
            ["type"] = l.Type switch
            {
                CloudType.Cumulonimbus => "CB",
                CloudType.ToweringCumulus => "TCU",
                _ => null,
            },
        }).ToArray());
        o["vertical_visibility_ft"] = c.VerticalVisibility?.Value;
    }

    /// <summary>The package's result in the same shape; statute miles converted with 1609.344 m as ours.</summary>
    private static JsonObject ProjectNpm(JsonObject t)
    {
        var changes = new JsonArray();
        foreach (var c in t["trends"]!.AsArray().Select(n => n!.AsObject()))
        {
            var validity = c["validity"]!.AsObject();
            var o = new JsonObject
            {
                ["kind"] = c["type"]!.GetValue<string>(),
                ["probability"] = c["probability"]?.GetValue<int>(),
                ["from"] = Time(validity["startDay"], validity["startHour"], validity["startMinutes"]),
                ["until"] = validity["endDay"] is null ? null : Time(validity["endDay"], validity["endHour"], null),
            };
            NpmConditions(o, c);
            changes.Add(o);
        }
        var baseForecast = new JsonObject();
        NpmConditions(baseForecast, t);
        var v = t["validity"]?.AsObject();
        return new JsonObject
        {
            ["station"] = t["station"]!.GetValue<string>(),
            ["valid_from"] = v is null ? null : Time(v["startDay"], v["startHour"], null),
            ["valid_until"] = v is null ? null : Time(v["endDay"], v["endHour"], null),
            ["amd"] = t["amendment"]?.GetValue<bool>() == true,
            ["cor"] = t["corrected"]?.GetValue<bool>() == true,
            ["cnl"] = t["canceled"]?.GetValue<bool>() == true,
            ["base"] = baseForecast,
            ["changes"] = changes,
        };
    }

    private static void NpmConditions(JsonObject o, JsonObject n)
    {
        var cavok = n["cavok"]?.GetValue<bool>() == true;
        double? visibility = null;
        if (cavok)
        {
            visibility = 10_000;
        }
        else if (n["visibility"] is JsonObject v)
        {
            var value = v["value"]!.GetValue<double>();
            visibility = v["unit"]!.GetValue<string>() == "SM"
                ? Math.Round(value * ReportGroups.MetresPerStatuteMile, 3)
                : value == 9999 ? 10_000 : value;
        }
        o["visibility_m"] = visibility;
        o["cavok"] = cavok;
        o["weather"] = new JsonArray(n["weatherConditions"]!.AsArray().Select(w => (JsonNode?)JsonValue.Create(
            w!["intensity"]?.GetValue<string>() + w["descriptive"]?.GetValue<string>()
            + string.Concat(w["phenomenons"]!.AsArray().Select(p => p!.GetValue<string>())))).ToArray());
        o["clouds"] = new JsonArray(n["clouds"]!.AsArray().Select(c => (JsonNode?)new JsonObject
        {
            ["cover"] = c!["quantity"]!.GetValue<string>(),
            ["base_ft"] = c["height"]?.GetValue<double>(),
            ["type"] = c["type"]?.GetValue<string>(),
        }).ToArray());
        o["vertical_visibility_ft"] = n["verticalVisibility"]?.GetValue<double>();
    }

    private static string Time(JsonNode? day, JsonNode? hour, JsonNode? minute) =>
        string.Create(CultureInfo.InvariantCulture,
            $"{day!.GetValue<int>():00}{hour!.GetValue<int>():00}{(minute?.GetValue<int>() ?? 0):00}");

    private static bool Same(JsonNode? a, JsonNode? b) => (a?.ToJsonString() ?? "null") == (b?.ToJsonString() ?? "null");

    private static void Count(Dictionary<string, int> counts, string rule) => counts[rule] = counts.GetValueOrDefault(rule) + 1;
}
