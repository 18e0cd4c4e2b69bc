using System.Text.Json.Nodes;
using OpsLvp.Core.Metar;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>Every report of the invented corpus decodes (or is refused) as its marker says.</summary>
public sealed class MetarCorpusTests
{
    private static readonly string[] s_designFields =
        ["station", "visibility_m", "cavok", "rvr", "clouds", "vertical_visibility_ft", "ceiling_ft", "weather"];

    [Fact]
    public void Corpus_HasAtLeast150ReportsIncludingMalformedOnes()
    {
        var entries = MetarCorpus.Load();
        Assert.True(entries.Count >= 150, $"corpus has {entries.Count} reports");
        Assert.Contains(entries, e => e.MustRefuse);
        Assert.Contains(entries, e => e.HasUnknownGroups);
        // Invented stations only (brief: no real aerodrome data).
        Assert.All(entries.Where(e => !e.MustRefuse), e => Assert.Matches(@"^(METAR |SPECI )?(COR )?X", e.Text.ToUpperInvariant()));
    }

    [Fact]
    public void Corpus_EachReportIsRefusedExactlyWhenMarked()
    {
        var wrong = new List<string>();
        foreach (var e in MetarCorpus.Load())
        {
            var ok = MetarDecoder.TryDecode(e.Text, out var report, out var error);
            if (ok == e.MustRefuse)
            {
                wrong.Add($"line {e.Line}: {(ok ? "decoded but marked '!'" : "refused: " + error)}: {e.Text}");
            }
            else if (ok && report!.UnknownGroups.Count > 0 != e.HasUnknownGroups)
            {
                wrong.Add($"line {e.Line}: unknown groups [{string.Join(' ', report.UnknownGroups)}] vs marker: {e.Text}");
            }
        }
        Assert.True(wrong.Count == 0, string.Join(Environment.NewLine, wrong));
    }

    [Fact]
    public void Corpus_JsonOfEachReportStartsWithTheDesignFieldsInOrder()
    {
        foreach (var e in MetarCorpus.Load().Where(e => !e.MustRefuse))
        {
            var json = JsonNode.Parse(MetarJson.Write(MetarDecoder.Decode(e.Text)))!.AsObject();
            Assert.Equal(s_designFields, json.Select(p => p.Key).Take(s_designFields.Length));
            foreach (var rvr in json["rvr"]!.AsArray())
            {
                Assert.Equal(["runway", "value_m", "max_m", "qualifier", "tendency"], rvr!.AsObject().Select(p => p.Key).Take(5));
            }
            foreach (var cloud in json["clouds"]!.AsArray())
            {
                Assert.Equal(["cover", "base_ft"], cloud!.AsObject().Select(p => p.Key).Take(2));
            }
        }
    }

    [Fact]
    public void Corpus_CeilingIsNeverAboveAnyBrokenOrOvercastLayerBelowLimit()
    {
        // Property of the ceiling rule (ICAO/EASA definition; docs/cli.md), checked over the whole corpus.
        foreach (var e in MetarCorpus.Load().Where(e => !e.MustRefuse))
        {
            var r = MetarDecoder.Decode(e.Text);
            foreach (var layer in r.Clouds.Where(c => c.CoversMoreThanHalf && c.Base is { } b && b < MetarReport.CeilingLimit))
            {
                Assert.True(r.Ceiling <= layer.Base, $"line {e.Line}: ceiling {r.Ceiling} above layer {layer.Base}");
            }
            if (r.VerticalVisibility is { } vv)
            {
                Assert.True(r.Ceiling <= vv, $"line {e.Line}: ceiling {r.Ceiling} above VV {vv}");
            }
        }
    }
}
