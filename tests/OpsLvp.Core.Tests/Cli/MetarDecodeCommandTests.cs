using System.Text.Json.Nodes;
using OpsLvp.Cli;

namespace OpsLvp.Core.Tests.Cli;

/// <summary><c>opslvp metar decode</c> run in-process through <see cref="CliApp.Run"/> (docs/cli.md). Reports are invented.</summary>
public sealed class MetarDecodeCommandTests
{
    private static (int Code, string Stdout, string Stderr) Run(params string[] args)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    [Fact]
    public void MetarDecode_GoodReport_WritesJsonAndExitsZero()
    {
        var (code, stdout, stderr) = Run("metar", "decode", "METAR XDMO 010620Z 24004KT 0400 R26L/0550N FG BKN002 08/08 Q1021");
        Assert.Equal(0, code);
        Assert.Equal("", stderr);
        var o = JsonNode.Parse(stdout)!.AsObject();
        Assert.Equal("XDMO", o["station"]!.GetValue<string>());
        Assert.Equal(400, o["visibility_m"]!.GetValue<double>());
        Assert.Equal(550, o["rvr"]![0]!["value_m"]!.GetValue<double>());
        Assert.Equal(200, o["ceiling_ft"]!.GetValue<double>());
    }

    [Fact]
    public void MetarDecode_UnreadableGroupsInTheBody_ExitZeroAndAreListedWithTheVisibilitySaidUnreadable()
    {
        // issue 11 §5: a body group the decoder cannot read is listed; an unreadable visibility is never a silent null
        var (code, stdout, stderr) = Run("metar", "decode", "METAR XDMO 010620Z 24004KT 04O0 FG XYZ123 OVC002 08/08 Q1021");
        Assert.Equal(0, code);
        Assert.Equal("", stderr);
        var o = JsonNode.Parse(stdout)!.AsObject();
        Assert.Null(o["visibility_m"]);
        Assert.Equal("unreadable", o["visibility_status"]!.GetValue<string>());
        Assert.Equal("04O0", o["visibility_group"]!.GetValue<string>());
        Assert.Equal(["04O0", "XYZ123"], o["unknown_groups"]!.AsArray().Select(n => n!.GetValue<string>()));
        Assert.Equal("reported", o["ceiling_status"]!.GetValue<string>());
    }

    [Fact]
    public void MetarDecode_StatuteMilesAndObscuredSky_GiveMetresAndUnknownCeiling()
    {
        var (code, stdout, _) = Run("metar", "decode", "METAR XDMO 010620Z 24004KT 1 1/2SM RVRNO BR VV/// 08/08 A3012");
        Assert.Equal(0, code);
        var o = JsonNode.Parse(stdout)!.AsObject();
        // 1.5 statute miles × 1609.344 m = 2414.016 m, rounded down
        Assert.Equal(2414, o["visibility_m"]!.GetValue<double>());
        Assert.Equal("SM", o["visibility_unit"]!.GetValue<string>());
        Assert.True(o["rvr_not_available"]!.GetValue<bool>());
        Assert.Null(o["ceiling_ft"]);
        Assert.Equal("unknown", o["ceiling_status"]!.GetValue<string>());
    }

    [Fact]
    public void MetarDecode_ReportSplitIntoSeveralArguments_IsJoined()
    {
        var (code, stdout, _) = Run("metar", "decode", "XDMO", "010620Z", "CAVOK");
        Assert.Equal(0, code);
        Assert.True(JsonNode.Parse(stdout)!["cavok"]!.GetValue<bool>());
    }

    [Theory]
    [InlineData("hello world", "not a location indicator")]
    [InlineData("", "empty report")]
    [InlineData("METAR XDMO 24004KT 0400", "not a time group")]
    public void MetarDecode_NotAMetar_WritesOneLineErrorAndExitsNonZero(string text, string expected)
    {
        var (code, stdout, stderr) = Run("metar", "decode", text);
        Assert.NotEqual(0, code);
        Assert.Equal("", stdout);
        Assert.StartsWith("error: ", stderr, StringComparison.Ordinal);
        Assert.Contains(expected, stderr, StringComparison.Ordinal);
        Assert.Single(stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries));
    }

    [Fact]
    public void MetarDecode_NoText_IsAUsageError()
    {
        var (code, stdout, stderr) = Run("metar", "decode");
        Assert.Equal(2, code);
        Assert.Equal("", stdout);
        Assert.Contains("missing report text", stderr, StringComparison.Ordinal);
    }
}
