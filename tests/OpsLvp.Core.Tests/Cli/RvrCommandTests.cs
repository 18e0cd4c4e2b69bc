using System.Text.Json;
using OpsLvp.Cli;

namespace OpsLvp.Core.Tests.Cli;

public sealed class RvrCommandTests
{
    private static (int Exit, string Stdout, string Stderr) Run(params string[] args)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var exit = CliApp.Run(args, stdout, stderr);
        return (exit, stdout.ToString(), stderr.ToString());
    }

    private static JsonElement RunOk(params string[] args)
    {
        var (exit, stdout, stderr) = Run(args);
        Assert.True(exit == 0, $"exit {exit}: {stderr}");
        Assert.Equal("", stderr);
        using var doc = JsonDocument.Parse(stdout);
        return doc.RootElement.Clone();
    }

    [Fact]
    public void Rvr_Mor300NightTenThousandCandela_Reports0900()
    {
        // MOR 300 m, night, I = 10 000 cd → lights ≈ 954 m, report 0900: computed from the formulas above (docs/sources.md Optics)
        var json = RunOk("rvr", "--mor-m", "300", "--light-intensity-cd", "10000", "--background-luminance", "1");

        Assert.Equal("0900", json.GetProperty("report").GetString());
        Assert.Equal(300, json.GetProperty("mor_m").GetDouble());
        Assert.Equal(300, json.GetProperty("object_m").GetDouble());
        Assert.Equal(954.1, json.GetProperty("lights_m").GetDouble()); // 954.10… rounded down to 0.1 m (RvrCommand)
        Assert.Equal(954.1, json.GetProperty("rvr_m").GetDouble());
    }

    [Theory]
    // Worked check values computed from the formulas above (docs/sources.md Optics), I = 10 000 cd;
    // bands — ICAO Annex 3, Attachment D (from memory); reporting — ICAO Annex 3, App 3, §4.3.6 (from memory)
    [InlineData("300", "--background-luminance", "5000", 573, "0550")]
    [InlineData("300", "--period", "day", 573, "0550")]
    [InlineData("600", "--period", "day", 945, "0900")]
    [InlineData("300", "--period", "night", 954, "0900")]
    public void Rvr_DomainWorkedValues_GiveTheReport(string mor, string option, string value, double lights, string report)
    {
        var json = RunOk("rvr", "--mor-m", mor, "--light-intensity-cd", "10000", option, value);

        Assert.Equal(report, json.GetProperty("report").GetString());
        Assert.Equal(lights, json.GetProperty("lights_m").GetDouble(), 0.5);
    }

    [Fact]
    public void Rvr_Mor1000AtNight_ReportsP2000()
    {
        // MOR 1000 m at night → above 2000 m (P2000): computed from the formulas above (docs/sources.md Optics)
        var json = RunOk("rvr", "--mor-m", "1000", "--light-intensity-cd", "10000", "--period", "night");

        Assert.Equal("P2000", json.GetProperty("report").GetString());
        Assert.True(json.GetProperty("rvr_m").GetDouble() > 2000);
    }

    [Fact]
    public void Rvr_Transmissometer75m070_GivesMor630()
    {
        // b = 75 m, T = 0.70 → MOR ≈ 630 m: computed from the formulas above (docs/sources.md Optics); 629.93 rounded down to 0.1 m
        var json = RunOk("rvr", "--transmittance", "0.70", "--baseline-m", "75", "--light-intensity-cd", "10000", "--period", "day");

        Assert.Equal(629.9, json.GetProperty("mor_m").GetDouble());
        Assert.Equal(json.GetProperty("mor_m").GetDouble(), json.GetProperty("object_m").GetDouble());
    }

    [Fact]
    public void Rvr_ExtinctionPerKm_IsReadInKilometres()
    {
        // σ = 10 km⁻¹ → MOR = 2.996/σ ≈ 299.57 m — CIE ILV 17-31-018; WMO-No. 8
        var json = RunOk("rvr", "--extinction-per-km", "10", "--light-intensity-cd", "0", "--period", "day");

        Assert.Equal(299.5, json.GetProperty("mor_m").GetDouble());
        Assert.Equal(0, json.GetProperty("lights_m").GetDouble());
        Assert.Equal("0275", json.GetProperty("report").GetString()); // 25 m steps below 400 — ICAO Annex 3, App 3, §4.3.6 (from memory)
    }

    [Fact]
    public void Rvr_Output_HasExactlyTheDesignedFields()
    {
        var json = RunOk("rvr", "--mor-m", "300", "--light-intensity-cd", "10000", "--period", "night");

        // docs/cli.md
        Assert.Equal(["mor_m", "lights_m", "object_m", "rvr_m", "report", "luminance_unknown"], json.EnumerateObject().Select(p => p.Name).ToArray());
        Assert.False(json.GetProperty("luminance_unknown").GetBoolean());
    }

    [Fact]
    public void Rvr_WithoutLuminanceOrPeriod_UsesTheBrightDayThresholdAndSaysLuminanceUnknown()
    {
        // docs/engine.md R19. docs/sources.md check (Allard's law; Annex 3 Att. D bands — from memory): MOR 300 m, 10 000 cd,
        // 20 000 cd/m² (bright day) gives 0400; the normal-day band gave 0550.
        var unknown = RunOk("rvr", "--mor-m", "300", "--light-intensity-cd", "10000");
        var bright = RunOk("rvr", "--mor-m", "300", "--light-intensity-cd", "10000", "--background-luminance", "20000");
        Assert.Equal("0400", unknown.GetProperty("report").GetString());
        Assert.Equal(bright.GetProperty("rvr_m").GetDouble(), unknown.GetProperty("rvr_m").GetDouble());
        Assert.True(unknown.GetProperty("luminance_unknown").GetBoolean());
        Assert.False(bright.GetProperty("luminance_unknown").GetBoolean());
    }

    [Theory]
    [InlineData(2, "missing --light-intensity-cd", "rvr", "--mor-m", "300", "--period", "day")]
    [InlineData(2, "give one of --mor-m", "rvr", "--light-intensity-cd", "10000", "--period", "day")]
    [InlineData(2, "give only one of", "rvr", "--mor-m", "300", "--extinction-per-km", "10", "--light-intensity-cd", "1", "--period", "day")]
    [InlineData(2, "go together", "rvr", "--transmittance", "0.7", "--light-intensity-cd", "1", "--period", "day")]
    [InlineData(2, "go together", "rvr", "--mor-m", "300", "--baseline-m", "75", "--light-intensity-cd", "1", "--period", "day")]
    [InlineData(2, "not both", "rvr", "--mor-m", "300", "--light-intensity-cd", "1", "--period", "day", "--background-luminance", "5")]
    [InlineData(2, "unknown option '--fog'", "rvr", "--fog", "thick")]
    [InlineData(2, "--mor-m needs a value", "rvr", "--mor-m")]
    [InlineData(2, "given more than once", "rvr", "--mor-m", "300", "--mor-m", "400")]
    [InlineData(1, "'abc' is not a number", "rvr", "--mor-m", "abc", "--light-intensity-cd", "1", "--period", "day")]
    [InlineData(1, "--mor-m must be greater than 0", "rvr", "--mor-m", "-5", "--light-intensity-cd", "1", "--period", "day")]
    [InlineData(1, "--extinction-per-km must be greater than 0", "rvr", "--extinction-per-km", "0", "--light-intensity-cd", "1", "--period", "day")]
    [InlineData(1, "--transmittance must be greater than 0 and less than 1", "rvr", "--transmittance", "1.5", "--baseline-m", "75", "--light-intensity-cd", "1", "--period", "day")]
    [InlineData(1, "--light-intensity-cd must be 0 or more", "rvr", "--mor-m", "300", "--light-intensity-cd", "-1", "--period", "day")]
    [InlineData(1, "--period must be night, intermediate, day or bright", "rvr", "--mor-m", "300", "--light-intensity-cd", "1", "--period", "dusk")]
    [InlineData(1, "greater than 0 with --continuous-threshold", "rvr", "--mor-m", "300", "--light-intensity-cd", "1", "--background-luminance", "0", "--continuous-threshold")]
    [InlineData(1, "'NaN' is not a number", "rvr", "--mor-m", "NaN", "--light-intensity-cd", "1", "--period", "day")]
    public void Rvr_BadInput_ExitsNonZeroWithOneErrorLine(int expectedExit, string fragment, params string[] args)
    {
        var (exit, stdout, stderr) = Run(args);

        Assert.Equal(expectedExit, exit);
        Assert.Equal("", stdout);
        var lines = stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Single(lines);
        Assert.StartsWith("error: ", lines[0], StringComparison.Ordinal);
        Assert.Contains(fragment, lines[0], StringComparison.Ordinal);
    }

    [Fact]
    public void Rvr_ContinuousThreshold_ChangesTheLightsRange()
    {
        var bands = RunOk("rvr", "--mor-m", "300", "--light-intensity-cd", "10000", "--background-luminance", "1000");
        var continuous = RunOk("rvr", "--mor-m", "300", "--light-intensity-cd", "10000", "--background-luminance", "1000", "--continuous-threshold");

        // At B = 1000 the continuous E_T (≈3.2e-5 lx, recalled for Doc 9328, unconfirmed) is below the band's 1e-4 lx
        Assert.True(continuous.GetProperty("lights_m").GetDouble() > bands.GetProperty("lights_m").GetDouble());
    }

    [Fact]
    public void Rvr_Help_PrintsUsageNamingTheRounding()
    {
        var (exit, stdout, stderr) = Run("rvr", "--help");

        Assert.Equal(0, exit);
        Assert.Equal("", stderr);
        Assert.StartsWith("usage: opslvp rvr ", stdout, StringComparison.Ordinal);
        Assert.Contains("rounded down to 0.1", stdout, StringComparison.Ordinal);
    }
}
