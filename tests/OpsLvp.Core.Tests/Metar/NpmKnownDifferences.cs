using System.Text.Json.Nodes;
using System.Text.RegularExpressions;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>
/// The expectation table of the cross-check: every known disagreement between our decoder and metar-taf-parser 9.1.3,
/// each with the rule that explains it. Behaviour of the package was established by running it (see
/// node/decode-corpus.mjs); our side follows WMO-No. 306 FM 15 and docs/cli.md.
/// </summary>
internal static partial class NpmKnownDifferences
{
    /// <summary>Whole-report rule: we refuse text that is not a METAR/SPECI (corpus lines marked "!"); the package
    /// returns a result for almost anything (e.g. "hello world" gives station "hello"), so nothing is compared.</summary>
    public const string WeRefuseTextThatIsNotAMetar = nameof(WeRefuseTextThatIsNotAMetar);

    /// <summary>Whole-report rule: the package does not fold case (a lower-case report decodes to almost nothing); we
    /// fold to upper case, so the package's result for the upper-cased text is compared instead.</summary>
    public const string NpmDoesNotFoldCase = nameof(NpmDoesNotFoldCase);

    /// <summary>Whole-report rule: the package throws (an error without message) on a missing wind <c>/////KT</c>
    /// followed by a direction variation group (<c>180V250</c>); we skip both as wind groups, so nothing is compared.</summary>
    public const string NpmFailsOnMissingWindWithVariation = nameof(NpmFailsOnMissingWindWithVariation);

    /// <summary>True when <see cref="NpmFailsOnMissingWindWithVariation"/> explains the package refusing <paramref name="text"/>.</summary>
    public static bool IsMissingWindWithVariation(string text) => MissingWindWithVariation().IsMatch(text.ToUpperInvariant());

    public static IReadOnlyList<KnownDifference> All { get; } =
    [
        new("NpmMetricRvrNeedsTendency", "rvr",
            "the package reads a metric RVR group only when it ends in U, D or N (R26/0550, R26/P2000, R29/0400V0800 are "
            + "dropped); WMO-No. 306 FM 15 makes the tendency optional, so we keep them",
            (v, _, _) => Remove(v, o => Str(o, "unit") == "m" && o["value_m"] is not null && o["tendency"] is null)),
        new("NpmDropsMetricVaryingBelowLimit", "rvr",
            "the package drops a varying metric group whose minimum is qualified M (R20/M0050V0150D); we keep it",
            (v, _, _) => Remove(v, o => Str(o, "unit") == "m" && o["max_m"] is not null && Str(o, "qualifier") == "M")),
        new("NpmDropsFeetTendencyWithoutSlash", "rvr",
            "the package reads a tendency on a feet group only after a slash (R26/0600FT/D); R26/0600FTD and "
            + "R26/0800V2000FTU are dropped; we accept both spellings",
            (v, _, text) => Remove(v, o => Str(o, "unit") == "ft" && o["tendency"] is not null
                && !Token(text, "R" + Str(o, "runway") + "/").Contains("FT/", StringComparison.Ordinal))),
        new("NpmDropsMissingRvr", "rvr",
            "the package ignores a missing RVR group (R09/////); we list it with value_m null so the runway shows as not reporting",
            (v, _, _) => Remove(v, o => o["value_m"] is null)),
        new("NpmPutsMaxQualifierOnGroup", "rvr",
            "for R20/0450VP2000U the package sets the group's indicator to P although P qualifies the maximum; we report "
            + "qualifier null and max_qualifier P (WMO-No. 306 FM 15: the indicator precedes the value it qualifies)",
            (v, _, _) =>
            {
                foreach (var o in v!.AsArray().Select(n => n!.AsObject()))
                {
                    if (o["qualifier"] is null && o["max_qualifier"] is not null)
                    {
                        o["qualifier"] = o["max_qualifier"]!.DeepClone();
                    }
                }
                return v;
            }),
        new("NpmListsNscAndSkcAsCloud", "clouds",
            "the package lists NSC and SKC as a cloud entry without height (NCD and CLR as nothing); they are not layers, "
            + "we report them in sky_condition",
            (v, ours, _) =>
            {
                if (Str(ours, "sky_condition") is "NSC" or "SKC")
                {
                    v!.AsArray().Add(new JsonObject { ["cover"] = Str(ours, "sky_condition"), ["base_ft"] = null, ["type"] = null });
                }
                return v;
            }),
        new("NpmDropsCoverUnknownLayer", "clouds",
            "the package ignores ///hhh (cover not determinable by an automatic system) and //////CB (a CB or TCU detected, "
            + "amount and height not determinable); we keep the layer with cover null because its base or type may matter, "
            + "and never count it as ceiling",
            (v, _, _) => Remove(v, o => o["cover"] is null)),
        new("NpmDropsZeroCloudBase", "clouds",
            "the package gives no height for a base of 000 (OVC000, SCT000): it treats 0 as absent; WMO-No. 306 FM 15 "
            + "hshshs = 000 is a base below 100 ft, so we report base_ft 0",
            (v, _, _) =>
            {
                foreach (var o in v!.AsArray().Select(n => n!.AsObject()).Where(o => o["base_ft"]?.GetValue<double>() == 0))
                {
                    o["base_ft"] = null;
                }
                return v;
            }),
        new("NpmDropsZeroCloudBase", "ceiling_ft",
            "follows from the cloud rule of the same name: a BKN000/OVC000 layer has no height in the package, so it is no "
            + "ceiling there; ours is 0 ft",
            (v, ours, _) =>
            {
                var layers = ours["clouds"]!.AsArray().Select(n => n!.AsObject())
                    .Where(c => Str(c, "cover") is "BKN" or "OVC" && c["base_ft"]?.GetValue<double>() is > 0 and < 20_000)
                    .Select(c => (double?)c["base_ft"]!.GetValue<double>());
                var min = layers.Append(ours["vertical_visibility_ft"]?.GetValue<double>()).Min();
                return min is { } m ? JsonValue.Create(m) : null;
            }),
    ];

    private static JsonNode? Remove(JsonNode? v, Func<JsonObject, bool> drop)
    {
        var array = v!.AsArray();
        foreach (var o in array.Select(n => n!.AsObject()).Where(drop).ToList())
        {
            array.Remove(o);
        }
        return array;
    }

    private static string? Str(JsonObject o, string key) => o[key]?.GetValue<string>();

    private static string Token(string text, string prefix) =>
        text.ToUpperInvariant().Split(' ', StringSplitOptions.RemoveEmptyEntries).FirstOrDefault(t => t.StartsWith(prefix, StringComparison.Ordinal)) ?? "";

    [GeneratedRegex(@"(^|\s)/////KT\s+\d{3}V\d{3}(\s|$)")]
    private static partial Regex MissingWindWithVariation();
}
