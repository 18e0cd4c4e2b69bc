using System.Net;
using System.Text.Json;
using Microsoft.Playwright;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.FaultCases;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Wall;

/// <summary>
/// A real storage fault under a real server, seen in a real Chromium (docs/reliability.md "Storage faults"): the data
/// folder is a small tmpfs that is filled while readings are pushed, then freed. The wall and the tablet show the
/// NOT RECORDING banner, the wall greys the measured values (opslvp.css, <c>body:has(.opslvp-not-recording)</c>), and
/// both go back once the server records again. Readings are invented.
/// </summary>
public sealed class NotRecordingBrowserTests(ITestOutputHelper output)
{
    private const string Banner = "[data-testid=not-recording]";

    private const string TdzValue = "[data-testid=wall-pos][data-position=TDZ] .wall-pos-value";

    [BrowserRootFact]
    public async Task DiskFull_ShowsTheBanner_AndGreysTheWallsValues_ThenBothGoBackWhenRecordingResumes()
    {
        using var fs = SmallMount.Mount(Path.Combine(Path.GetTempPath(), "opslvp-e2e", Guid.NewGuid().ToString("N")), 32);
        await using var browser = await BrowserSession.LaunchAsync();
        await using var server = await OpsLvpServer.StartOnFolderAsync(fs.Root);
        var wall = await browser.NewWallPageAsync();
        await WallBrowserTests.OpenLiveWallAsync(wall, server);
        var tablet = await browser.NewPageAsync(1024, 768, touch: true);
        await BrowserAccess.SignInAsync(tablet, server, TestAccounts.Apron, "/actions");

        var t = DateTimeOffset.UtcNow.AddSeconds(-30);
        await server.PushAsync(t, (Tdz, "rvr", 1500), (Mid, "rvr", 1500), (End, "rvr", 1500), (Ceilometer, "cloud_base", 1000));
        await Expect(wall.Locator("[data-testid=wall-pos][data-position=TDZ] [data-testid=wall-pos-value]")).ToHaveTextAsync("1500", new() { Timeout = 15_000 });
        await Expect(wall.Locator(Banner)).ToHaveCountAsync(0);
        var recording = await StyleAsync(wall, TdzValue);
        output.WriteLine($"recording: {recording}");
        Assert.Equal("none", recording.GetProperty("filter").GetString());
        Assert.DoesNotContain("line-through", recording.GetProperty("textDecorationLine").GetString(), StringComparison.Ordinal);

        // fill the folder, pushing until the server refuses (503: it cannot store them)
        fs.Fill();
        var refused = false;
        for (var i = 0; i < 2000 && !refused; i++)
        {
            t = t.AddMilliseconds(5);
            var (status, text) = await server.TryPushAsync(t, (Tdz, "rvr", 1490), (Mid, "rvr", 1490), (End, "rvr", 1490));
            refused = status == HttpStatusCode.ServiceUnavailable;
            Assert.True(refused || status == HttpStatusCode.Accepted, $"push answered {(int)status}: {text}");
        }
        Assert.True(refused, "the full folder never made the server refuse a push");

        foreach (var page in new[] { wall, tablet })
        {
            await Expect(page.Locator(Banner)).ToBeVisibleAsync(new() { Timeout = 30_000 });
            await Expect(page.Locator(Banner)).ToContainTextAsync("NOT RECORDING since");
        }
        var greyed = await StyleAsync(wall, TdzValue);
        output.WriteLine($"not recording: {greyed}");
        Assert.Equal("rgb(138, 138, 138)", greyed.GetProperty("color").GetString());
        Assert.Equal("grayscale(1)", greyed.GetProperty("filter").GetString());
        Assert.Contains("line-through", greyed.GetProperty("textDecorationLine").GetString(), StringComparison.Ordinal);
        Assert.NotEqual(recording.GetProperty("color").GetString(), greyed.GetProperty("color").GetString());
        // every measured figure on the wall, not only the first
        var figures = await wall.EvaluateAsync<JsonElement>("""
            () => [...document.querySelectorAll('.wall-pos-value, .wall-fig-value')].map(e => getComputedStyle(e).filter)
            """);
        Assert.NotEmpty(figures.EnumerateArray());
        Assert.All(figures.EnumerateArray(), f => Assert.Equal("grayscale(1)", f.GetString()));
        // the phase is the last recorded one: drained of its colour, and the note beside it says so
        Assert.Equal("grayscale(1)", (await StyleAsync(wall, "[data-testid=wall-phase]")).GetProperty("filter").GetString());
        // and so is the team page's phase chip (the console's has the same rule, opslvp.css)
        Assert.Equal("grayscale(1)", (await StyleAsync(tablet, "[data-testid=actions-phase]")).GetProperty("filter").GetString());
        // the note is the wall component's, the banner the layout's: two renders, so the note gets its own (generous) wait
        await Expect(wall.Locator("[data-testid=wall-phase-note]").First).ToContainTextAsync("phase as last recorded before", new() { Timeout = 30_000 });

        var wallShot = Artifacts.PathFor("wall-not-recording.png");
        await wall.ScreenshotAsync(new() { Path = wallShot });
        var tabletShot = Artifacts.PathFor("tablet-not-recording.png");
        await tablet.ScreenshotAsync(new() { Path = tabletShot });
        output.WriteLine($"screenshots: {wallShot}, {tabletShot}");

        // space returns: the server records again, and the screens go back
        fs.Free();
        var deadline = DateTime.UtcNow.AddSeconds(60);
        while (true)
        {
            t = t.AddMilliseconds(5);
            var (status, _) = await server.TryPushAsync(t, (Tdz, "rvr", 1480), (Mid, "rvr", 1480), (End, "rvr", 1480));
            if (status == HttpStatusCode.Accepted)
            {
                break;
            }
            Assert.True(DateTime.UtcNow < deadline, "recording did not resume within 60 s of space returning");
            await Task.Delay(250);
        }
        foreach (var page in new[] { wall, tablet })
        {
            await Expect(page.Locator(Banner)).ToHaveCountAsync(0, new() { Timeout = 30_000 });
        }
        var back = await StyleAsync(wall, TdzValue);
        output.WriteLine($"recording again: {back}");
        Assert.Equal(recording.GetProperty("color").GetString(), back.GetProperty("color").GetString());
        Assert.Equal("none", (await StyleAsync(wall, "[data-testid=wall-phase]")).GetProperty("filter").GetString());
        Assert.Equal("none", (await StyleAsync(tablet, "[data-testid=actions-phase]")).GetProperty("filter").GetString());
        await Expect(wall.Locator("[data-testid=wall-phase-note]")).ToHaveCountAsync(0, new() { Timeout = 30_000 });
        Assert.Equal("none", back.GetProperty("filter").GetString());
        browser.AssertNoCspViolationOrUncaughtError();
    }

    private static async Task<JsonElement> StyleAsync(IPage page, string selector) =>
        await page.Locator(selector).EvaluateAsync<JsonElement>(
            "e => { const s = getComputedStyle(e); return { color: s.color, filter: s.filter, textDecorationLine: s.textDecorationLine }; }");
}
