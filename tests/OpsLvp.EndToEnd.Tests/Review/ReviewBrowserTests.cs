using System.Text.Json;
using Microsoft.Playwright;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.EndToEnd.Tests.Wall;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Review;

/// <summary>
/// Post-event review in Chromium: an episode runs on the real app through to normal (invented readings; a profile
/// variant with 2 s recovery dwells and no cancellation checklist), then a viewer reviews it and runs a what-if.
/// </summary>
public sealed class ReviewBrowserTests(ITestOutputHelper output)
{
    private const string PhaseTitle = "[data-testid=wall-phase-title]";

    [BrowserFact]
    public async Task FinishedEpisode_ShowsItsChart_AndAHigherActiveThreshold_GivesMoreTimeInForce()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        await using var server = await OpsLvpServer.StartAsync(Variant(recoverDwellSeconds: 2, cancellationItem: false));
        var wall = await browser.NewWallPageAsync();
        await WallBrowserTests.OpenLiveWallAsync(wall, server);

        await PushAllAsync(server, 1500);
        await Expect(wall.Locator(PhaseTitle)).ToHaveTextAsync("NORMAL OPERATIONS", new() { Timeout = 10_000 });
        // 400 m < active.rvrBelowM 550 m, enter dwell 0 s (invented test profile, inForceNeedsSafeguards false): LVP in force.
        await PushAllAsync(server, 400);
        await Expect(wall.Locator(PhaseTitle)).ToHaveTextAsync("LVP IN FORCE", new() { Timeout = 10_000 });
        // 800 m: above active.rvrRecoverM 650 m, so active ends after its 2 s dwell; a what-if active threshold of
        // 900 m would have kept it in force for these seconds.
        for (var i = 0; i < 6; i++)
        {
            await PushAllAsync(server, 800);
            await Task.Delay(1_000);
        }
        await Expect(wall.Locator(PhaseTitle)).Not.ToHaveTextAsync("LVP IN FORCE", new() { Timeout = 10_000 });
        // 1500 m: above every recovery value; back to normal after the dwells.
        for (var i = 0; i < 30 && await wall.Locator(PhaseTitle).TextContentAsync() != "NORMAL OPERATIONS"; i++)
        {
            await PushAllAsync(server, 1500);
            await Task.Delay(1_000);
        }
        await Expect(wall.Locator(PhaseTitle)).ToHaveTextAsync("NORMAL OPERATIONS", new() { Timeout = 5_000 });

        var page = await browser.NewPageAsync(1600, 1100);
        await BrowserAccess.SignInAsync(page, server, TestAccounts.Viewer, "/review");
        var row = page.Locator("[data-testid=episode-row]");
        await Expect(row).ToHaveCountAsync(1, new() { Timeout = 10_000 });
        await Expect(row).Not.ToContainTextAsync("running");
        // Open the picked episode's own address (a click during the list's prerender can be lost on a loaded machine).
        var href = await row.Locator("a").First.GetAttributeAsync("href");
        Assert.StartsWith("/review/", href, StringComparison.Ordinal);
        await page.GotoAsync(new Uri(server.BaseAddress, href).ToString());

        var chart = page.Locator("[data-testid=timeline-chart]");
        await Expect(chart).ToHaveAttributeAsync("data-rendered", "1", new() { Timeout = 30_000 });
        await Expect(chart.Locator("canvas").First).ToBeVisibleAsync();
        var bands = await page.EvaluateAsync<JsonElement>("""
            () => {
              const el = document.querySelector('[data-testid=timeline-chart]');
              const option = window.echarts.getInstanceByDom(el).getOption();
              return option.series.filter(s => s.markArea && s.markArea.data).flatMap(s => s.markArea.data.map(d => d[0].name));
            }
            """);
        var names = bands.EnumerateArray().Select(e => e.GetString()).ToList();
        output.WriteLine("phase bands: " + string.Join(", ", names));
        Assert.NotEmpty(names);

        await SetNumberAsync(page, "whatif-active-rvr-below", "900");
        await SetNumberAsync(page, "whatif-active-rvr-recover", "950");
        await page.Locator("[data-testid=whatif-run]").ClickAsync();
        var diff = page.Locator("[data-testid=whatif-active-diff]");
        await Expect(diff).ToBeVisibleAsync(new() { Timeout = 10_000 });
        var text = (await diff.TextContentAsync())!.Trim();
        output.WriteLine("what-if time in force difference: " + text);
        Assert.StartsWith("+", text, StringComparison.Ordinal);
        Assert.NotEqual("+0 s", text);

        var path = Artifacts.PathFor("review.png");
        await page.ScreenshotAsync(new() { Path = path, FullPage = true });
        output.WriteLine($"screenshot: {path}");
        browser.AssertNoCspViolationOrUncaughtError();
    }

    private static Task PushAllAsync(OpsLvpServer server, double rvr) =>
        server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", rvr), (Mid, "rvr", rvr), (End, "rvr", rvr), (Ceilometer, "cloud_base", 1000));

    private static async Task SetNumberAsync(IPage page, string testId, string value)
    {
        var input = page.Locator($"[data-testid={testId}] input, input[data-testid={testId}]").First;
        await input.FillAsync(value);
        await input.PressAsync("Tab");
    }
}
