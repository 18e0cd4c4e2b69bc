using System.Text.Json.Nodes;
using OpsLvp.Cli;

namespace OpsLvp.Core.Tests.Cli;

/// <summary><c>opslvp taf decode</c> run in-process through <see cref="CliApp.Run"/> (docs/forecasts.md). Forecasts are invented.</summary>
public sealed class TafDecodeCommandTests
{
    private static (int Code, string Stdout, string Stderr) Run(params string[] args)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    [Fact]
    public void TafDecode_GoodForecast_WritesJsonAndExitsZero()
    {
        var (code, stdout, stderr) = Run("taf", "decode",
            "TAF XDMO 010500Z 0106/0206 24005KT 9999 SCT030 BECMG 0108/0110 2000 BR BKN005 PROB30 TEMPO 0110/0114 0300 FG VV002");
        Assert.Equal(0, code);
        Assert.Equal("", stderr);
        var o = JsonNode.Parse(stdout)!.AsObject();
        Assert.Equal("XDMO", o["station"]!.GetValue<string>());
        Assert.Equal("010500Z", o["issue_time"]!.GetValue<string>());
        Assert.Equal("010600", o["valid_from"]!.GetValue<string>());
        Assert.Equal("020600", o["valid_until"]!.GetValue<string>());
        Assert.Equal(10_000, o["base"]!["visibility_m"]!.GetValue<double>());
        Assert.Equal("P", o["base"]!["visibility_qualifier"]!.GetValue<string>());
        var changes = o["changes"]!.AsArray();
        Assert.Equal(2, changes.Count);
        Assert.Equal("BECMG", changes[0]!["kind"]!.GetValue<string>());
        Assert.Equal(500, changes[0]!["ceiling_ft"]!.GetValue<double>());
        Assert.Equal("PROB30 TEMPO", changes[1]!["indicator"]!.GetValue<string>());
        Assert.Equal(30, changes[1]!["probability"]!.GetValue<int>());
        Assert.Equal("011000", changes[1]!["from"]!.GetValue<string>());
        Assert.Equal(300, changes[1]!["visibility_m"]!.GetValue<double>());
        Assert.Equal(200, changes[1]!["vertical_visibility_ft"]!.GetValue<double>());
        Assert.Equal("FG", changes[1]!["weather"]![0]!.GetValue<string>());
    }

    [Fact]
    public void TafDecode_StatuteMiles_WritesMilesAndMetres()
    {
        var (_, stdout, _) = Run("taf", "decode", "TAF", "XQRT", "010500Z", "0106/0206", "1", "1/2SM", "BR", "OVC004");
        var b = JsonNode.Parse(stdout)!["base"]!;
        Assert.Equal(1.5, b["visibility_sm"]!.GetValue<double>());
        // 1.5 × 1609.344 m (international mile).
        Assert.Equal(2414.016, b["visibility_m"]!.GetValue<double>(), 6);
    }

    [Theory]
    [InlineData("hello world", "not a location indicator")]
    [InlineData("METAR XDMO 010620Z 24004KT 0400 FG", "not a TAF")]
    public void TafDecode_NotATaf_WritesOneLineErrorAndExitsOne(string text, string expected)
    {
        var (code, stdout, stderr) = Run("taf", "decode", text);
        Assert.Equal(1, code);
        Assert.Equal("", stdout);
        Assert.StartsWith("error: ", stderr, StringComparison.Ordinal);
        Assert.Contains(expected, stderr, StringComparison.Ordinal);
        Assert.Single(stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries));
    }

    [Fact]
    public void TafDecode_NoText_IsAUsageError()
    {
        var (code, _, stderr) = Run("taf", "decode");
        Assert.Equal(2, code);
        Assert.Contains("missing forecast text", stderr, StringComparison.Ordinal);
    }
}
