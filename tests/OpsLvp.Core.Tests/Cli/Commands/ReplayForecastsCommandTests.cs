using OpsLvp.Cli;
using OpsLvp.Core.Tests.Engine.Replay;

namespace OpsLvp.Core.Tests.Cli.Commands;

/// <summary>`opslvp replay --forecasts` (docs/cli.md, docs/replay.md "Forecasts CSV") over the invented scenario files.</summary>
public class ReplayForecastsCommandTests
{
    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    [Fact]
    public void Forecasts_AreInputs_AndTheirEventsAreWritten()
    {
        var (code, output, err) = Run("replay", "--profile", ReplayScenarioTests.Scenario("xdmo-forecast-profile.json"),
            "--readings", ReplayScenarioTests.Scenario("forecast-clear-night.readings.csv"),
            "--forecasts", ReplayScenarioTests.Scenario("forecast-amended.forecasts.csv"));
        Assert.Equal((0, ""), (code, err));
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(2, lines.Count(l => l.StartsWith("{\"event\":\"forecast_received\",\"time\":", StringComparison.Ordinal)));
        Assert.StartsWith("{\"event\":\"forecast_flag_changed\",\"time\":\"2026-12-01T03:00:00Z\",\"on\":true,\"by\":\"forecast\",\"source\":\"TAF 0400–0700 TEMPO 0300 FG VV002\"",
            lines.First(l => l.Contains("forecast_flag_changed", StringComparison.Ordinal)));
        Assert.Contains(lines, l => l.StartsWith("{\"event\":\"transition\",\"time\":\"2026-12-01T03:00:30Z\",\"from\":\"normal\",\"to\":\"preparation\"", StringComparison.Ordinal));
    }

    [Fact]
    public void BadForecastsFile_FailsWithOneLineNamingFileAndLine()
    {
        var file = Path.Combine(Path.GetTempPath(), $"opslvp-bad-forecasts-{Guid.NewGuid():N}.csv");
        File.WriteAllText(file, "time,origin,text\n2026-12-01T03:00:00Z,speci,METAR XDMO\n");
        try
        {
            var (code, output, err) = Run("replay", "--profile", ReplayScenarioTests.Scenario("xdmo-forecast-profile.json"),
                "--readings", ReplayScenarioTests.Scenario("forecast-clear-night.readings.csv"), "--forecasts", file);
            Assert.Equal(1, code);
            Assert.Equal("", output);
            Assert.Equal($"error: {file} line 2: origin must be taf or trend, not 'speci'", err.TrimEnd());
        }
        finally
        {
            File.Delete(file);
        }
    }
}
