using System.Text.Json.Nodes;
using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// The expectation table of the TAF cross-check: every known disagreement between our decoder and metar-taf-parser
/// 9.1.3, each with the rule that explains it. The package's behaviour was established by running it (see
/// node/decode-taf-corpus.mjs); our side follows WMO-No. 306 FM 51 and docs/forecasts.md.
/// </summary>
internal static class TafKnownDifferences
{
    /// <summary>Whole-forecast rule: we refuse text that is not a TAF (corpus lines marked "!"); nothing is compared.</summary>
    public const string WeRefuseTextThatIsNotATaf = nameof(WeRefuseTextThatIsNotATaf);

    /// <summary>Whole-forecast rule: the package does not fold case; its result for the upper-cased text is compared.</summary>
    public const string NpmDoesNotFoldCase = nameof(NpmDoesNotFoldCase);

    /// <summary>Whole-forecast rule: the package throws ("Invalid weather string") on <c>TAF CCCC YYGGggZ NIL</c>; we
    /// decode it as a NIL forecast, so nothing is compared.</summary>
    public const string NpmFailsOnNil = nameof(NpmFailsOnNil);

    public static IReadOnlyList<TafKnownDifference> All { get; } =
    [
        new("NpmListsNscAndSkcAsCloud",
            "the package lists NSC and SKC as a cloud layer without height; we keep them as the sky condition (no layer), "
            + "as the METAR cross-check does",
            (ours, report) => EachForecast(ours, report, (o, c) =>
            {
                if (c.SkyCondition is { } sky)
                {
                    o["clouds"]!.AsArray().Add(new JsonObject { ["cover"] = sky, ["base_ft"] = null, ["type"] = null });
                }
            })),
        new("NpmListsNswAsWeather",
            "the package lists NSW (end of significant weather, WMO-No. 306 FM 51) as a weather phenomenon; we keep it "
            + "as a flag, since it forecasts no weather",
            (ours, report) => EachForecast(ours, report, (o, c) =>
            {
                if (c.NoSignificantWeather)
                {
                    o["weather"]!.AsArray().Add("NSW");
                }
            })),
    ];

    /// <summary>Applies <paramref name="edit"/> to the base forecast and every change, with the decoded conditions beside each.</summary>
    private static void EachForecast(JsonObject ours, TafReport report, Action<JsonObject, ForecastConditions> edit)
    {
        edit(ours["base"]!.AsObject(), report.Base);
        var changes = ours["changes"]!.AsArray();
        for (var i = 0; i < changes.Count && i < report.Changes.Count; i++)
        {
            edit(changes[i]!.AsObject(), report.Changes[i].Conditions);
        }
    }
}
