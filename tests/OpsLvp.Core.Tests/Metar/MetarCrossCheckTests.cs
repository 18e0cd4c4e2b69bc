using System.Text.Json.Nodes;
using OpsLvp.Core.Metar;
using Xunit.Abstractions;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>
/// Independent cross-check (DEVELOPERS.md "Tests"): every corpus report is decoded by the npm package metar-taf-parser 9.1.3
/// through Node.js and its docs/cli.md fields are compared with ours. A disagreement must be explained by a named
/// rule of <see cref="NpmKnownDifferences"/>; any other disagreement fails the test.
/// </summary>
public sealed class MetarCrossCheckTests(ITestOutputHelper output)
{
    private static readonly string[] s_fields =
        ["station", "visibility_m", "cavok", "rvr", "clouds", "vertical_visibility_ft", "ceiling_ft", "weather"];

    private static readonly string[] s_rvrKeys = ["runway", "value_m", "max_m", "qualifier", "tendency"];

    private static readonly string[] s_cloudKeys = ["cover", "base_ft", "type"];

    private readonly ITestOutputHelper _output = output;

    [NodeFact]
    public void Corpus_AgreesWithNpmMetarTafParser_OrEveryDifferenceIsExplained()
    {
        Assert.True(NodeTool.IsAvailable,
            "Node.js (node and npm on PATH) is required for the METAR cross-check when CI=true or OPSLVP_REQUIRE_BROWSER=1, but was not found");
        var npm = RunNpmDecoder();
        var unexplained = new List<string>();
        var fired = new Dictionary<string, int>(StringComparer.Ordinal);
        var fullyAgreeing = 0;
        var fieldsCompared = 0;

        foreach (var entry in MetarCorpus.Load())
        {
            Assert.True(npm.TryGetValue(entry.Line, out var theirs), $"npm script gave no result for corpus line {entry.Line}");
            if (!MetarDecoder.TryDecode(entry.Text, out var report, out var error))
            {
                if (entry.MustRefuse)
                {
                    Count(fired, NpmKnownDifferences.WeRefuseTextThatIsNotAMetar);
                }
                else
                {
                    unexplained.Add($"line {entry.Line}: we refuse ({error}) but the corpus expects a decode: {entry.Text}");
                }
                continue;
            }
            if (theirs["upper"] is JsonObject upper)
            {
                Count(fired, NpmKnownDifferences.NpmDoesNotFoldCase);
                theirs = upper;
            }
            if (theirs["ok"]!.GetValue<bool>() is false && NpmKnownDifferences.IsMissingWindWithVariation(entry.Text))
            {
                Count(fired, NpmKnownDifferences.NpmFailsOnMissingWindWithVariation);
                continue;
            }
            if (theirs["ok"]!.GetValue<bool>() is false)
            {
                unexplained.Add($"line {entry.Line}: npm refuses ({theirs["error"]}) but we decode: {entry.Text}");
                continue;
            }

            var ours = JsonNode.Parse(MetarJson.Write(report!))!.AsObject();
            var npmProjection = ProjectNpm(theirs["metar"]!.AsObject());
            var agreesAll = true;
            foreach (var field in s_fields)
            {
                fieldsCompared++;
                var ourValue = ours[field]?.DeepClone();
                var npmValue = npmProjection[field];
                if (Same(Strip(field, ourValue), npmValue))
                {
                    continue;
                }
                agreesAll = false;
                var used = new List<string>();
                foreach (var rule in NpmKnownDifferences.All.Where(r => r.Field == field))
                {
                    var before = Strip(field, ourValue)?.ToJsonString();
                    ourValue = rule.ModelNpm(ourValue, ours, entry.Text);
                    if (Strip(field, ourValue)?.ToJsonString() != before)
                    {
                        used.Add(rule.Name);
                    }
                }
                if (Same(Strip(field, ourValue), npmValue))
                {
                    used.ForEach(u => Count(fired, u));
                }
                else
                {
                    unexplained.Add($"line {entry.Line} field {field}: ours {Strip(field, ours[field]?.DeepClone())?.ToJsonString() ?? "null"}"
                        + $" npm {npmValue?.ToJsonString() ?? "null"} (after rules [{string.Join(", ", used)}]): {entry.Text}");
                }
            }
            if (agreesAll)
            {
                fullyAgreeing++;
            }
        }

        _output.WriteLine($"reports agreeing on every §4.1 field without any rule: {fullyAgreeing}; fields compared: {fieldsCompared}");
        foreach (var (rule, count) in fired.OrderBy(p => p.Key, StringComparer.Ordinal))
        {
            _output.WriteLine($"explained by {rule}: {count}");
        }
        Assert.True(unexplained.Count == 0,
            $"{unexplained.Count} unexplained disagreement(s) with metar-taf-parser:{Environment.NewLine}{string.Join(Environment.NewLine, unexplained)}");
        // The comparison must have had something to compare: most of the corpus agrees outright.
        Assert.True(fullyAgreeing >= 80, $"only {fullyAgreeing} reports agree outright; the comparison looks broken");
    }

    private static Dictionary<int, JsonObject> RunNpmDecoder()
    {
        var dir = Path.Combine(AppContext.BaseDirectory, "Metar", "node");
        if (!File.Exists(Path.Combine(dir, "node_modules", "metar-taf-parser", "package.json")))
        {
            var (code, stdout, stderr) = NodeTool.Run(NodeTool.Npm, dir, TimeSpan.FromMinutes(5), "ci", "--no-audit", "--no-fund");
            Assert.True(code == 0, $"npm ci failed in {dir} (exit {code}): {stderr}{stdout}");
        }
        var run = NodeTool.Run("node", dir, TimeSpan.FromMinutes(2), "decode-corpus.mjs", MetarCorpus.FilePath);
        Assert.True(run.ExitCode == 0, $"node decode-corpus.mjs failed (exit {run.ExitCode}): {run.Stderr}");
        return run.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries)
            .Select(l => JsonNode.Parse(l)!.AsObject())
            .ToDictionary(o => o["line"]!.GetValue<int>());
    }

    /// <summary>
    /// The package's result in the shape of docs/cli.md. Feet RVR is converted with the same arithmetic as ours
    /// (0.3048 m/ft, rounded down) so that the package's reading of the digits, qualifiers and tendency is what is compared.
    /// </summary>
    private static JsonObject ProjectNpm(JsonObject m)
    {
        var cavok = m["cavok"]?.GetValue<bool>() == true;
        JsonNode? visibility = null;
        if (cavok)
        {
            visibility = 10_000.0;
        }
        else if (m["visibility"] is JsonObject v && v["value"] is not null)
        {
            // (the package gives a null value for a group it cannot compute, e.g. 1/0SM; ours is null too)
            var value = v["value"]!.GetValue<double>();
            var unit = v["unit"]!.GetValue<string>();
            // Statute miles with the same arithmetic as ours (1609.344 m per mile, rounded down to the metre), so that
            // the package's reading of the group (whole, fraction, mixed "1 1/2SM", M/P) is what is compared.
            visibility = unit switch
            {
                "m" => value == 9999 ? 10_000.0 : value,
                "SM" => Math.Floor(value * 1609.344),
                _ => JsonValue.Create(value.ToString(System.Globalization.CultureInfo.InvariantCulture) + unit),
            };
        }
        var rvr = new JsonArray();
        foreach (var r in m["runwaysInfo"]!.AsArray().Select(n => n!.AsObject()).Where(o => o["minRange"] is not null))
        {
            var feet = r["unit"]!.GetValue<string>() == "FT";
            double Metres(JsonNode n) => feet ? Math.Floor(n.GetValue<double>() * 0.3048) : n.GetValue<double>();
            rvr.Add(new JsonObject
            {
                ["runway"] = r["name"]!.GetValue<string>(),
                ["value_m"] = Metres(r["minRange"]!),
                ["max_m"] = r["maxRange"] is { } max ? Metres(max) : null,
                ["qualifier"] = r["indicator"]?.GetValue<string>(),
                ["tendency"] = r["trend"]?.GetValue<string>(),
            });
        }
        var clouds = new JsonArray();
        foreach (var c in m["clouds"]!.AsArray().Select(n => n!.AsObject()))
        {
            clouds.Add(new JsonObject
            {
                ["cover"] = c["quantity"]!.GetValue<string>(),
                ["base_ft"] = c["height"]?.GetValue<double>(),
                ["type"] = c["type"]?.GetValue<string>(),
            });
        }
        double? vv = m["verticalVisibility"]?.GetValue<double>();
        // Ceiling: lowest BKN/OVC base below 20 000 ft, or VV (docs/cli.md), applied to the package's layers.
        var ceiling = clouds.Select(n => n!.AsObject())
            .Where(c => c["cover"]!.GetValue<string>() is "BKN" or "OVC" && c["base_ft"] is not null && c["base_ft"]!.GetValue<double>() < 20_000)
            .Select(c => (double?)c["base_ft"]!.GetValue<double>())
            .Append(vv)
            .Min();
        var weather = new JsonArray();
        foreach (var w in m["weatherConditions"]!.AsArray().Select(n => n!.AsObject()))
        {
            weather.Add(w["intensity"]?.GetValue<string>() + w["descriptive"]?.GetValue<string>()
                + string.Concat(w["phenomenons"]!.AsArray().Select(p => p!.GetValue<string>())));
        }
        return new JsonObject
        {
            ["station"] = m["station"]!.GetValue<string>(),
            ["visibility_m"] = visibility,
            ["cavok"] = cavok,
            ["rvr"] = rvr,
            ["clouds"] = clouds,
            ["vertical_visibility_ft"] = vv,
            ["ceiling_ft"] = ceiling,
            ["weather"] = weather,
        };
    }

    /// <summary>Our value reduced to the keys the package can be compared on.</summary>
    private static JsonNode? Strip(string field, JsonNode? value)
    {
        var keys = field switch
        {
            "rvr" => s_rvrKeys,
            "clouds" => s_cloudKeys,
            _ => null,
        };
        if (keys is null || value is null)
        {
            return value;
        }
        var result = new JsonArray();
        foreach (var o in value.AsArray().Select(n => n!.AsObject()))
        {
            var reduced = new JsonObject();
            foreach (var k in keys)
            {
                reduced[k] = o[k]?.DeepClone();
            }
            result.Add(reduced);
        }
        return result;
    }

    private static bool Same(JsonNode? a, JsonNode? b) => (a?.ToJsonString() ?? "null") == (b?.ToJsonString() ?? "null");

    private static void Count(Dictionary<string, int> counts, string rule) => counts[rule] = counts.GetValueOrDefault(rule) + 1;
}
