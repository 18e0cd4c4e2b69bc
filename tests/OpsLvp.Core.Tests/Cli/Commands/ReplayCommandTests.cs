using System.Text.Json;
using OpsLvp.Cli;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Tests.Engine.Replay;

namespace OpsLvp.Core.Tests.Cli.Commands;

/// <summary>`opslvp replay` (docs/cli.md) over the invented scenario files.</summary>
public class ReplayCommandTests
{
    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    [Fact]
    public void Replay_WritesOneJsonLinePerEvent_WithTransitionsInTheFixedShape()
    {
        var (code, output, err) = Run("replay", "--profile", ReplayScenarioTests.Scenario("xdmo-profile.json"),
            "--readings", ReplayScenarioTests.Scenario("r8-episode.readings.csv"), "--actions", ReplayScenarioTests.Scenario("r8-episode.actions.csv"));
        Assert.Equal((0, ""), (code, err));
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.All(lines, l => Assert.True(JsonDocument.Parse(l).RootElement.TryGetProperty("event", out _)));
        var first = lines.First(l => l.Contains("\"transition\"", StringComparison.Ordinal));
        Assert.StartsWith("{\"event\":\"transition\",\"time\":\"2026-12-01T03:05:30Z\",\"from\":\"normal\",\"to\":\"preparation\",\"by\":\"auto\",\"reason\":\"RVR 07 TDZ 800 m < 1000 m\"", first);
        Assert.Equal(5, lines.Count(l => l.StartsWith("{\"event\":\"transition\"", StringComparison.Ordinal)));
    }

    [Fact]
    public void Replay_MalformedReadingsLine_FailsWithOneLineNamingFileAndLine()
    {
        var file = Path.Combine(Path.GetTempPath(), $"opslvp-bad-{Guid.NewGuid():N}.csv");
        File.WriteAllText(file, "time,sensor,kind,value,status\n2026-12-01T03:00:00Z,RVR07T,rvr,abc,ok\n");
        try
        {
            var (code, output, err) = Run("replay", "--profile", ReplayScenarioTests.Scenario("xdmo-profile.json"), "--readings", file);
            Assert.Equal(1, code);
            Assert.Equal("", output);
            Assert.Equal($"error: {file} line 2: bad value 'abc'", err.TrimEnd());
        }
        finally
        {
            File.Delete(file);
        }
    }

    [Fact]
    public void Replay_WithoutRequiredOptions_IsAUsageError()
    {
        var (code, _, err) = Run("replay", "--readings", "x.csv");
        Assert.Equal(2, code);
        Assert.Contains("--profile and --readings are required", err);
    }

    [Fact]
    public void Replay_MissingProfileFile_FailsWithOneLine()
    {
        var (code, _, err) = Run("replay", "--profile", "/nonexistent/p.json", "--readings", ReplayScenarioTests.Scenario("r7-dwell.readings.csv"));
        Assert.Equal(1, code);
        Assert.Single(err.TrimEnd().Split('\n'));
        Assert.Contains("/nonexistent/p.json", err);
    }

    [Fact]
    public void Replay_Until_LetsTrailingDwellsComplete()
    {
        var profile = ReplayScenarioTests.Scenario("xdmo-profile.json");
        var readings = ReplayScenarioTests.Scenario("r7-dwell.readings.csv");
        var (_, without, _) = Run("replay", "--profile", profile, "--readings", readings);
        var (code, with, _) = Run("replay", "--profile", profile, "--readings", readings, "--until", "2026-12-01T03:30:00Z");
        Assert.Equal(0, code);
        Assert.DoesNotContain("feed-silent:RVR25T", without);
        Assert.Contains("\"key\":\"feed-silent:RVR25T\"", with);
    }

    /// <summary>A copy of the invented scenario profile with <paramref name="edit"/> applied to its text, written to a temp file.</summary>
    private static string EditedProfile(Func<string, string> edit)
    {
        var original = File.ReadAllText(ReplayScenarioTests.Scenario("xdmo-profile.json"));
        var edited = edit(original);
        Assert.NotEqual(original, edited);
        var file = Path.Combine(Path.GetTempPath(), $"opslvp-profile-{Guid.NewGuid():N}.json");
        File.WriteAllText(file, edited);
        return file;
    }

    private static string ZeroActiveRecoverDwell(string json) =>
        json.Replace("\"enterDwellSeconds\": 30, \"recoverDwellSeconds\": 600", "\"enterDwellSeconds\": 30, \"recoverDwellSeconds\": 0", StringComparison.Ordinal);

    [Fact]
    public void Replay_InvalidProfile_FailsWithOneLineNamingTheFirstFieldAndCountingTheRest()
    {
        // Two problems: a lower-case location indicator and a zero recovery dwell (docs/engine.md R6, R7; docs/profile.md rules)
        var file = EditedProfile(j => ZeroActiveRecoverDwell(j.Replace("\"id\": \"XDMO\"", "\"id\": \"xdmo\"", StringComparison.Ordinal)));
        try
        {
            var (code, output, err) = Run("replay", "--profile", file, "--readings", ReplayScenarioTests.Scenario("r7-dwell.readings.csv"));
            Assert.Equal(1, code);
            Assert.Equal("", output);
            var line = Assert.Single(err.TrimEnd().Split('\n'));
            Assert.Equal($"error: {file}: invalid profile: aerodrome.id: 'xdmo' is not a location indicator; expected four capital letters A–Z (and 1 more problem)", line);
        }
        finally
        {
            File.Delete(file);
        }
    }

    [Fact]
    public void Replay_ProfileWithOneProblem_NamesItsFieldWithoutACount()
    {
        var file = EditedProfile(ZeroActiveRecoverDwell);
        try
        {
            var (code, output, err) = Run("replay", "--profile", file, "--readings", ReplayScenarioTests.Scenario("r7-dwell.readings.csv"));
            Assert.Equal((1, ""), (code, output));
            var line = Assert.Single(err.TrimEnd().Split('\n'));
            Assert.StartsWith($"error: {file}: invalid profile: thresholds.active.recoverDwellSeconds: is 0; expected more than 0 seconds", line, StringComparison.Ordinal);
            Assert.DoesNotContain("more problem", line, StringComparison.Ordinal);
        }
        finally
        {
            File.Delete(file);
        }
    }

    [Fact]
    public void ReplayEpisode_WithAnInvalidWhatIfProfile_FailsNamingTheField()
    {
        var file = EditedProfile(ZeroActiveRecoverDwell);
        var export = Path.Combine(Path.GetTempPath(), $"opslvp-episode-{Guid.NewGuid():N}.json");
        File.WriteAllText(export, OpsLvp.Core.Tests.Review.ReviewFixtures.DemoNight.Export().ToJson());
        try
        {
            var (code, output, err) = Run("replay", "--episode", export, "--profile", file);
            Assert.Equal((1, ""), (code, output));
            Assert.Contains("thresholds.active.recoverDwellSeconds", Assert.Single(err.TrimEnd().Split('\n')), StringComparison.Ordinal);
        }
        finally
        {
            File.Delete(file);
            File.Delete(export);
        }
    }

    [Theory]
    [InlineData("xdmo-profile.json")]
    [InlineData("xdmo-confirm-profile.json")]
    public void ScenarioProfiles_PassTheValidatorReplayApplies(string profile)
    {
        var result = ProfileValidator.Validate(ProfileLoader.Load(ReplayScenarioTests.Scenario(profile)));
        Assert.True(result.IsValid, result.ToString());
    }
}
