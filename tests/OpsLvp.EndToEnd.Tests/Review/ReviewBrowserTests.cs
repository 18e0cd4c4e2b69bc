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

        await RunEpisodeAsync(wall, server, _ => Task.CompletedTask);

        var page = await OpenTheOnlyEpisodeAsync(browser, server);

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

    [BrowserFact]
    public async Task FinishedEpisode_ShowsCapabilityBands_AndAWhatIfWithAHigherCatIIMinimum_DiffersFromRecorded()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        // CAT I needs TDZ 550 m and no LVP, CAT II TDZ 300 m and LVP in force (TestProfile.WithCapability, illustrative).
        await using var server = await OpsLvpServer.StartAsync(WithCapability(Variant(recoverDwellSeconds: 2, cancellationItem: false)));
        var wall = await browser.NewWallPageAsync();
        await WallBrowserTests.OpenLiveWallAsync(wall, server);
        var best09 = wall.Locator("[data-testid=wall-cap-row][data-direction='09'] [data-testid=wall-cap-best]");

        // CAT I available while TDZ is at or above 550 m (normal, and preparation at 800 m); CAT II only while LVP are in
        // force (at 400 m, above its 300 m); nothing else in between.
        await RunEpisodeAsync(wall, server, async phase =>
        {
            await Expect(best09).ToHaveTextAsync(phase == "LVP IN FORCE" ? "CAT II" : "CAT I", new() { Timeout = 10_000 });
            if (phase == "LVP IN FORCE")
            {
                await wall.ScreenshotAsync(new() { Path = Artifacts.PathFor("review-capability-wall-in-force.png") });
            }
        });

        var page = await OpenTheOnlyEpisodeAsync(browser, server);

        // The band under the chart: CAT II while LVP were in force, CAT I before and after (in preparation), in that order.
        var segments = page.Locator("[data-testid=cap-band][data-direction='09'] [data-testid=cap-band-segment]");
        await Expect(segments.First).ToBeVisibleAsync(new() { Timeout = 30_000 });
        var best = await segments.EvaluateAllAsync<string[]>("els => els.map(e => e.dataset.best)");
        output.WriteLine("09 band: " + string.Join(" | ", best));
        output.WriteLine("09 band segments: " + string.Join(" | ", await segments.EvaluateAllAsync<string[]>("els => els.map(e => e.getAttribute('aria-label'))")));
        output.WriteLine("capability table: " + string.Join(" | ", await page.Locator("[data-testid=review-capability-row]").AllInnerTextsAsync()));
        Assert.Contains("CAT II", best);
        var catII = Array.IndexOf(best, "CAT II");
        Assert.Contains("CAT I", best[..catII]);
        Assert.Contains("CAT I", best[(catII + 1)..]);
        var catIIText = await segments.Nth(catII).GetAttributeAsync("aria-label");
        output.WriteLine("CAT II segment: " + catIIText);
        Assert.Contains("CAT I", catIIText!.Replace("CAT II", "", StringComparison.Ordinal), StringComparison.Ordinal); // CAT I named as not available, with its reason

        // What-if: CAT II on 09 needing TDZ 450 m would not have been available at 400 m: differs from recorded.
        var options = await page.Locator("[data-testid=whatif-op-select] option").AllTextContentsAsync();
        var catIIOption = options.ToList().FindIndex(o => o.Trim() == "09 CAT II");
        Assert.True(catIIOption > 0, "operations offered: " + string.Join(", ", options));
        await page.Locator("[data-testid=whatif-op-select]").SelectOptionAsync(new SelectOptionValue { Index = catIIOption });
        await SetNumberAsync(page, "whatif-op-min-tdz", "450");
        await page.Locator("[data-testid=whatif-run]").ClickAsync();
        var verdict = page.Locator("[data-testid=whatif-capability-direction][data-direction='09'] [data-testid=whatif-capability-verdict]");
        await Expect(verdict).ToHaveTextAsync("09: differs from recorded", new() { Timeout = 15_000 });

        var path = Artifacts.PathFor("review-capability.png");
        await page.ScreenshotAsync(new() { Path = path, FullPage = true });
        output.WriteLine($"screenshot: {path}");
        browser.AssertNoCspViolationOrUncaughtError();
    }

    /// <summary>
    /// One episode through to normal, by pushed readings (invented) against the test profile's illustrative values with
    /// 2 s recovery dwells: 1500 m (normal); 400 m for 4 s (below active.rvrBelowM 550 m, enter dwell 0 s: LVP in force
    /// at once, inForceNeedsSafeguards false); 800 m for 6 s (above active.rvrRecoverM 650 m, below preparation's 1000 m:
    /// LVP leave force after the 2 s dwell, preparation stays; a what-if active threshold of 900 m would have kept them
    /// in force); 1500 m until normal. <paramref name="reached"/> gets the wall's phase title after each step.
    /// </summary>
    private static async Task RunEpisodeAsync(IPage wall, OpsLvpServer server, Func<string, Task> reached)
    {
        var title = wall.Locator(PhaseTitle);
        await PushAllAsync(server, 1500);
        await Expect(title).ToHaveTextAsync("NORMAL OPERATIONS", new() { Timeout = 10_000 });
        await reached("NORMAL OPERATIONS");
        await PushForAsync(server, 400, seconds: 4);
        await Expect(title).ToHaveTextAsync("LVP IN FORCE", new() { Timeout = 10_000 });
        await reached("LVP IN FORCE");
        await PushForAsync(server, 800, seconds: 6);
        await Expect(title).ToHaveTextAsync("LVP PREPARATION", new() { Timeout = 10_000 });
        await reached("LVP PREPARATION");
        for (var i = 0; i < 30 && await title.TextContentAsync() != "NORMAL OPERATIONS"; i++)
        {
            await PushForAsync(server, 1500, seconds: 1);
        }
        await Expect(title).ToHaveTextAsync("NORMAL OPERATIONS", new() { Timeout = 5_000 });
        await reached("NORMAL OPERATIONS");
    }

    private static async Task PushForAsync(OpsLvpServer server, double rvr, int seconds)
    {
        for (var i = 0; i < seconds; i++)
        {
            await PushAllAsync(server, rvr);
            await Task.Delay(1_000);
        }
    }

    /// <summary>Signs a viewer in to the review list, waits for its one finished episode and opens that episode's own
    /// address (a click during the list's prerender can be lost on a loaded machine).</summary>
    private static async Task<IPage> OpenTheOnlyEpisodeAsync(BrowserSession browser, OpsLvpServer server)
    {
        var page = await browser.NewPageAsync(1600, 1100);
        await BrowserAccess.SignInAsync(page, server, TestAccounts.Viewer, "/review");
        var row = page.Locator("[data-testid=episode-row]");
        await Expect(row).ToHaveCountAsync(1, new() { Timeout = 10_000 });
        await Expect(row).Not.ToContainTextAsync("running");
        var href = await row.Locator("a").First.GetAttributeAsync("href");
        Assert.StartsWith("/review/", href, StringComparison.Ordinal);
        await page.GotoAsync(new Uri(server.BaseAddress, href).ToString());
        return page;
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
