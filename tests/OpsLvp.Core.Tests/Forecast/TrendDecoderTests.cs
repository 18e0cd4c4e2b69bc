using OpsLvp.Core.Forecast;
using OpsLvp.Core.Metar;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// TREND forms of a METAR/SPECI: WMO-No. 306 FM 15 section 4 (NOSIG, BECMG, TEMPO with FM/TL/AT times), as summarised
/// in docs/sources.md "Forecasts" (from memory there). Reports and values are invented.
/// </summary>
public sealed class TrendDecoderTests
{
    [Fact]
    public void Nosig_IsOneNoSignificantChange()
    {
        var t = TrendDecoder.Decode("NOSIG");
        Assert.Equal(ForecastChangeKind.NoSignificantChange, Assert.Single(t.Changes).Kind);
    }

    [Fact]
    public void BlankTrend_HasNoChanges()
    {
        Assert.Empty(TrendDecoder.Decode(null).Changes);
    }

    [Fact]
    public void BecmgAndTempo_WithFromUntilAndAt_AreDecoded()
    {
        var t = TrendDecoder.Decode("BECMG FM0700 TL0800 0800 BR BKN004 TEMPO TL0830 0300 FG VV001 BECMG AT0815 9999 NSW");
        Assert.Equal(3, t.Changes.Count);
        var becmg = t.Changes[0];
        Assert.Equal(ForecastChangeKind.Becoming, becmg.Kind);
        Assert.Equal(new ForecastTime(null, 7, 0), becmg.Window.From);
        Assert.Equal(new ForecastTime(null, 8, 0), becmg.Window.Until);
        Assert.Equal("FM0700 TL0800", becmg.Window.ToString());
        Assert.Equal(new Metres(800), becmg.Conditions.Visibility!.Distance);
        var tempo = t.Changes[1];
        Assert.Equal(ForecastChangeKind.Temporary, tempo.Kind);
        Assert.Null(tempo.Window.From);
        Assert.Equal(new ForecastTime(null, 8, 30), tempo.Window.Until);
        Assert.Equal(new Feet(100), tempo.Conditions.VerticalVisibility);
        Assert.Equal("TEMPO TL0830 0300 FG VV001", tempo.Text);
        Assert.Equal(new ForecastTime(null, 8, 15), t.Changes[2].Window.At);
        Assert.True(t.Changes[2].Conditions.NoSignificantWeather);
        Assert.Empty(t.UnknownGroups);
    }

    [Fact]
    public void TrendKeptByTheMetarDecoder_DecodesIntoChangeGroups()
    {
        var metar = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 1500 BR BKN005 08/07 Q1021 TEMPO FM0640 0400 FG VV002 RMK QFE1015");
        var t = TrendDecoder.Decode(metar.Trend);
        var change = Assert.Single(t.Changes);
        Assert.Equal(new Metres(400), change.Conditions.Visibility!.Distance);
        Assert.Equal(new ForecastTime(null, 6, 40), change.Window.From);
    }

    [Fact]
    public void TrendJson_WritesEachChangeWithItsTimes()
    {
        var o = System.Text.Json.Nodes.JsonNode.Parse(TafJson.Write(TrendDecoder.Decode("BECMG AT0730 0600 FG NOSIG")))!;
        var changes = o["changes"]!.AsArray();
        Assert.Equal("BECMG", changes[0]!["kind"]!.GetValue<string>());
        Assert.Equal("0730", changes[0]!["at"]!.GetValue<string>());
        Assert.Null(changes[0]!["from"]);
        Assert.Equal(600, changes[0]!["visibility_m"]!.GetValue<double>());
        Assert.Equal("NOSIG", changes[1]!["kind"]!.GetValue<string>());
    }

    [Theory]
    [InlineData("0400 FG", "does not start a TREND")]
    [InlineData("TEMPO FM2560 0400 FG", "out of range")]
    public void NotATrend_IsRefusedWithAMessage(string text, string expected)
    {
        var ex = Assert.Throws<ForecastFormatException>(() => TrendDecoder.Decode(text));
        Assert.Contains(expected, ex.Message, StringComparison.Ordinal);
    }
}
