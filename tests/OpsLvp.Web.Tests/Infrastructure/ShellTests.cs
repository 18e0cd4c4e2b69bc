using System.Net;
using System.Text.Json;
using OpsLvp.Web.Components.Shell;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>The app shell as served over real Kestrel: layout, safety line, demo badge and the app's own assets.</summary>
public sealed class ShellTests
{
    private const string TinyScenario = """
        # invented test scenario
        time,sensor,kind,value,status
        00:00:00,T1,rvr,1500,ok
        00:01:00,T1,rvr,900,ok
        """;

    [Fact]
    public async Task HomePage_HasSafetyLine_AndLinksTheWall_AndNoBadgeOutsideDemo()
    {
        await using var app = OpsLvpApp.Start();

        var html = WebUtility.HtmlDecode(await app.Client.GetStringAsync(new Uri("/", UriKind.Relative)));

        Assert.Contains(SafetyNotice.Text, html, StringComparison.Ordinal);
        Assert.Contains("href=\"/wall\"", html, StringComparison.Ordinal);
        Assert.DoesNotContain("demo-badge", html, StringComparison.Ordinal);
        Assert.Contains("assets/opslvp.css", html, StringComparison.Ordinal);
    }

    [Fact]
    public async Task OwnAssets_AreServedFromTheTopLevelFolder()
    {
        await using var app = OpsLvpApp.Start();

        using var css = await app.Client.GetAsync(new Uri("/assets/opslvp.css", UriKind.Relative));
        using var icon = await app.Client.GetAsync(new Uri("/assets/icon.svg", UriKind.Relative));

        Assert.Equal(HttpStatusCode.OK, css.StatusCode);
        Assert.Equal("text/css", css.Content.Headers.ContentType?.MediaType);
        Assert.Contains(".opslvp-safety-line", await css.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        Assert.Equal(HttpStatusCode.OK, icon.StatusCode);
        Assert.Equal("image/svg+xml", icon.Content.Headers.ContentType?.MediaType);
    }

    [Fact]
    public async Task DemoMode_ShowsBadge_RunsSimulatorOnDemoClock_AndHealthSaysDemo()
    {
        var scenario = Path.Combine(Path.GetTempPath(), "opslvp-tests", Guid.NewGuid().ToString("N") + ".csv");
        Directory.CreateDirectory(Path.GetDirectoryName(scenario)!);
        await File.WriteAllTextAsync(scenario, TinyScenario);
        try
        {
            await using var app = OpsLvpApp.Start(new Dictionary<string, string?>
            {
                ["Demo:Simulator"] = "On",
                ["Demo:Speed"] = "600",
                ["Demo:Start"] = "2026-01-15T02:00:00Z",
                ["Demo:ScenarioPath"] = scenario,
                ["Demo:ActionsPath"] = "",
                ["Engine:Enabled"] = "false", // the test reads the pipeline itself
            });

            var html = WebUtility.HtmlDecode(await app.Client.GetStringAsync(new Uri("/", UriKind.Relative)));
            Assert.Contains("DEMO ×600", html, StringComparison.Ordinal);

            // At ×600 one demo minute is 0.1 s of real time.
            var first = await app.NextBatchAsync(b => b.Source == "demo" && b.Readings.Count > 0);
            var second = await app.NextBatchAsync(b => b.Source == "demo" && b.Readings.Count > 0);
            Assert.Equal(TimeSpan.FromMinutes(1), second.Readings[0].Time - first.Readings[0].Time);
            Assert.True(first.Readings[0].Time >= new DateTimeOffset(2026, 1, 15, 2, 0, 0, TimeSpan.Zero));
            Assert.True(first.Readings[0].Time < new DateTimeOffset(2026, 1, 16, 2, 0, 0, TimeSpan.Zero));

            var health = await app.GetHealthAsync();
            Assert.True(health.GetProperty("demo").GetBoolean());
            Assert.Equal(600, health.GetProperty("demoSpeed").GetDouble());
            var demoTime = health.GetProperty("time").GetDateTimeOffset();
            Assert.True(demoTime >= second.Readings[0].Time, "health time is demo time");
            Assert.Equal(JsonValueKind.Array, health.GetProperty("feeds").ValueKind);
        }
        finally
        {
            File.Delete(scenario);
        }
    }
}
