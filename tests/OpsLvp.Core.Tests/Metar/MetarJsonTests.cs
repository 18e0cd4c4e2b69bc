using System.Text.Json.Nodes;
using OpsLvp.Core.Metar;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>The JSON of docs/cli.md for whole reports (station XDMO and values invented).</summary>
public sealed class MetarJsonTests
{
    [Fact]
    public void Json_FogReport_HasTheDesignFieldsAndValues()
    {
        var json = MetarJson.Write(MetarDecoder.Decode(
            "METAR XDMO 010620Z 24004KT 0400 0200NE R26L/0550N R08/M0050 R15/0400V0800U FG VV001 08/08 Q1021 NOSIG"));
        Assert.StartsWith(
            """{"station":"XDMO","visibility_m":400,"cavok":false,"rvr":[{"runway":"26L","value_m":550,"max_m":null,"qualifier":null,"tendency":"N",""",
            json,
            StringComparison.Ordinal);
        var o = JsonNode.Parse(json)!.AsObject();
        Assert.Equal("M", o["rvr"]![1]!["qualifier"]!.GetValue<string>());
        Assert.Equal(800, o["rvr"]![2]!["max_m"]!.GetValue<double>());
        Assert.Equal("U", o["rvr"]![2]!["tendency"]!.GetValue<string>());
        Assert.Empty(o["clouds"]!.AsArray());
        Assert.Equal(100, o["vertical_visibility_ft"]!.GetValue<double>());
        Assert.Equal(100, o["ceiling_ft"]!.GetValue<double>());
        Assert.Equal(["FG"], o["weather"]!.AsArray().Select(n => n!.GetValue<string>()));
        Assert.Equal(200, o["min_visibility_m"]!.GetValue<double>());
        Assert.Equal("NOSIG", o["trend"]!.GetValue<string>());
    }

    [Fact]
    public void Json_Cavok_Gives10000AndNullCeiling()
    {
        var o = JsonNode.Parse(MetarJson.Write(MetarDecoder.Decode("METAR XQRT 020550Z 36002KT CAVOK 12/05 Q1018")))!.AsObject();
        Assert.Equal(10_000, o["visibility_m"]!.GetValue<double>());
        Assert.True(o["cavok"]!.GetValue<bool>());
        Assert.Null(o["ceiling_ft"]);
        Assert.Null(o["vertical_visibility_ft"]);
    }

    [Fact]
    public void Json_FeetRvr_SaysUnitAndKeepsReportedValue()
    {
        var rvr = JsonNode.Parse(MetarJson.Write(MetarDecoder.Decode("METAR XPLN 031150Z 17006KT 1200 R22/1100FT BR OVC003")))!["rvr"]![0]!;
        // 1100 ft x 0.3048 = 335.28 m, rounded down
        Assert.Equal(335, rvr["value_m"]!.GetValue<double>());
        Assert.Equal("ft", rvr["unit"]!.GetValue<string>());
        Assert.Equal(1100, rvr["reported_value"]!.GetValue<double>());
    }

    [Fact]
    public void Json_CloudLayer_HasCoverBaseAndType()
    {
        var clouds = JsonNode.Parse(MetarJson.Write(MetarDecoder.Decode("METAR XPLN 031050Z 18012KT 2000 +RA BKN006 OVC015CB")))!["clouds"]!.ToJsonString();
        Assert.Equal("""[{"cover":"BKN","base_ft":600,"type":null},{"cover":"OVC","base_ft":1500,"type":"CB"}]""", clouds);
    }
}
