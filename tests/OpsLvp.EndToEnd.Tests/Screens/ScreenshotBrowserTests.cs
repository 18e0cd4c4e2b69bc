using Microsoft.Playwright;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.EndToEnd.Tests.Wall;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Screens;

/// <summary>
/// The screenshots of docs/screens.md: wall (1920×1080), console (1440×900), tablet (1024×768) and phone (390×844) in
/// each state of one invented episode, then its review page. Readings and people are invented; thresholds and the runway
/// capability section are the test profile's (illustrative).
/// </summary>
public sealed class ScreenshotBrowserTests(ITestOutputHelper output)
{
    [BrowserFact]
    public async Task OneEpisode_IsPhotographedOnWallConsoleTabletAndReview_InEachState()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        // In force only once safeguarded (docs/engine.md R13): 400 m first shows the held preparation, the two ticks then
        // put LVP in force.
        await using var server = await OpsLvpServer.StartAsync(WithCapability(Variant(recoverDwellSeconds: 2, inForceNeedsSafeguards: true)));
        var wall = await browser.NewWallPageAsync();
        await WallBrowserTests.OpenLiveWallAsync(wall, server);
        var console = await browser.NewPageAsync(1440, 900);
        await BrowserAccess.SignInAsync(console, server, TestAccounts.Manager, "/console");
        var tablet = await browser.NewPageAsync(1024, 768, touch: true);
        await BrowserAccess.SignInAsync(tablet, server, TestAccounts.Apron, "/actions");
        var lights = await browser.NewPageAsync(1024, 768, touch: true);
        await BrowserAccess.SignInAsync(lights, server, TestAccounts.Lights, "/actions");
        var phone = await browser.NewPageAsync(390, 844, touch: true);
        await BrowserAccess.SignInAsync(phone, server, TestAccounts.Lights, "/actions");

        await PushAsync(server, 1500);
        await ShootAsync("normal", "NORMAL OPERATIONS");
        await PushAsync(server, 900);
        await ShootAsync("preparation", "LVP PREPARATION");
        await PushAsync(server, 400);
        await ShootAsync("conditions-met", "LVP CONDITIONS MET — SAFEGUARDS INCOMPLETE");

        await TickAsync(tablet, "prep-works");
        await TickAsync(lights, "prep-lights");
        await PushAsync(server, 400);
        await ShootAsync("in-force", "LVP IN FORCE");

        // 800 m ≥ active.rvrRecoverM 650 m held past the 2 s dwell: cancellation with its one mandatory item open.
        for (var i = 0; i < 20 && await wall.Locator("[data-testid=wall-phase-title]").TextContentAsync() != "CANCELLING LVP"; i++)
        {
            await PushAsync(server, 800);
            await Task.Delay(1_000);
        }
        await ShootAsync("cancelling", "CANCELLING LVP");

        var review = await browser.NewPageAsync(1440, 900);
        await BrowserAccess.SignInAsync(review, server, TestAccounts.Manager, "/review");
        await Expect(review.Locator("a[href^='/review/']").First).ToBeVisibleAsync(new() { Timeout = 10_000 });
        await review.Locator("a[href^='/review/']").First.ClickAsync();
        await review.WaitForURLAsync(url => new Uri(url).AbsolutePath.StartsWith("/review/", StringComparison.Ordinal));
        await Task.Delay(2_000);
        await SaveAsync(review, "screen-review-episode.png", fullPage: true);

        async Task ShootAsync(string state, string headline)
        {
            await Expect(wall.Locator("[data-testid=wall-phase-title]")).ToHaveTextAsync(headline, new() { Timeout = 15_000 });
            await Expect(console.Locator("[data-testid=console-phase]")).ToHaveTextAsync(headline, new() { Timeout = 15_000 });
            await Task.Delay(1_500);
            await SaveAsync(wall, $"screen-wall-{state}.png");
            await SaveAsync(console, $"screen-console-{state}.png");
            await SaveAsync(tablet, $"screen-tablet-{state}.png");
            await SaveAsync(phone, $"screen-phone-{state}.png", fullPage: true);
            await AssertAlarmsNotCutOffAsync(phone, state);
        }
    }

    /// <summary>On the phone every alarm's kind, message and time lie inside the screen and none is clipped (an alarm
    /// whose text is cut off at the edge says less than it seems to).</summary>
    private static async Task AssertAlarmsNotCutOffAsync(IPage phone, string state)
    {
        var cut = await phone.EvaluateAsync<string[]>("""
            () => [...document.querySelectorAll('[data-testid=alarm] .alarm-kind, [data-testid=alarm] .alarm-message, [data-testid=alarm] .alarm-since')]
              .filter(e => { const r = e.getBoundingClientRect(); return r.right > window.innerWidth + 0.5 || r.left < -0.5 || e.scrollWidth > e.clientWidth + 1; })
              .map(e => e.className + ': ' + e.textContent.trim())
            """);
        Assert.True(cut.Length == 0, $"phone, {state}: alarm text cut off: {string.Join(" | ", cut)}");
    }

    private static Task PushAsync(OpsLvpServer server, double rvr) =>
        server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", rvr), (Mid, "rvr", rvr + 50), (End, "rvr", rvr + 80), (Ceilometer, "cloud_base", 1000));

    private static async Task TickAsync(IPage tablet, string itemId)
    {
        var card = tablet.Locator($"[data-testid=action-item][data-item-id={itemId}]");
        await Expect(card).ToHaveAttributeAsync("data-status", "open", new() { Timeout = 10_000 });
        await card.Locator("[data-testid=action-tick]").TapAsync();
        await card.Locator("[data-testid=action-confirm-yes]").TapAsync();
        await Expect(card).ToHaveAttributeAsync("data-status", "done", new() { Timeout = 10_000 });
    }

    private async Task SaveAsync(IPage page, string name, bool fullPage = false)
    {
        await Expect(page.Locator("html")).Not.ToHaveClassAsync(new System.Text.RegularExpressions.Regex("opslvp-nolive"), new() { Timeout = 20_000 });
        var path = Artifacts.PathFor(name);
        await page.ScreenshotAsync(new() { Path = path, FullPage = fullPage });
        output.WriteLine($"screenshot: {path}");
    }
}
