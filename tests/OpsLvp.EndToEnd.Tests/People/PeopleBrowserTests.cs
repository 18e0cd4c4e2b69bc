using System.Diagnostics;
using System.Text.Json;
using Microsoft.Playwright;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.EndToEnd.Tests.Wall;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.People;

/// <summary>
/// The people's screens in Chromium against the real app: a ground staff tablet (800×1280), the duty console and
/// the wall, each in its own browser context signed in as an invented account. Readings are invented; the
/// thresholds they cross are the test profile's illustrative values.
/// </summary>
public sealed class PeopleBrowserTests(ITestOutputHelper output)
{
    private const string PhaseTitle = "[data-testid=wall-phase-title]";

    /// <summary>Finger-sized touch target (WCAG 2.2 target size guidance and common practice for gloved use: 48 px).</summary>
    private const double MinTargetPx = 48;

    [BrowserFact]
    public async Task TabletTick_ShowsDoneOnTheWall_AndADroppedConnectionShowsTheBanner()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        await using var server = await OpsLvpServer.StartAsync();
        var wall = await browser.NewWallPageAsync();
        await WallBrowserTests.OpenLiveWallAsync(wall, server);
        var tablet = await browser.NewPageAsync(800, 1280, touch: true);
        await BrowserAccess.SignInAsync(tablet, server, TestAccounts.Apron, "/actions");

        // 900 m < preparation.rvrBelowM 1000 m, above active 550 m (invented test profile): preparation at once.
        await server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 900), (Mid, "rvr", 950), (End, "rvr", 980), (Ceilometer, "cloud_base", 1000));
        await Expect(wall.Locator(PhaseTitle)).ToHaveTextAsync("LVP PREPARATION", new() { Timeout = 10_000 });
        var card = tablet.Locator("[data-testid=action-item][data-item-id=prep-works]");
        await Expect(card).ToHaveAttributeAsync("data-status", "open", new() { Timeout = 10_000 });
        // The apron desk sees its own item only, not the lighting crew's.
        await Expect(tablet.Locator("[data-testid=action-item][data-item-id=prep-lights]")).ToHaveCountAsync(0);
        await Expect(wall.Locator("[data-testid=wall-item][data-item=prep-works]")).ToHaveCountAsync(1);

        await AssertTargetsFingerSizedAsync(tablet);
        await SaveAsync(tablet, "tablet-portrait.png");
        await tablet.SetViewportSizeAsync(1280, 800);
        await AssertTargetsFingerSizedAsync(tablet);
        await SaveAsync(tablet, "tablet-landscape.png");
        await tablet.SetViewportSizeAsync(800, 1280);

        await card.Locator("[data-testid=action-tick]").TapAsync();
        await Expect(card.Locator("[data-testid=action-confirm]")).ToBeVisibleAsync();
        await AssertTargetsFingerSizedAsync(tablet);
        await SaveAsync(tablet, "tablet-confirm.png");
        var clock = Stopwatch.StartNew();
        await card.Locator("[data-testid=action-confirm-yes]").TapAsync();

        // How fast is the benchmarks' business (docs/benchmarks.md); here only that it arrives, the time written out.
        await Expect(wall.Locator("[data-testid=wall-item][data-item=prep-works]")).ToHaveCountAsync(0, new() { Timeout = 15_000 });
        await Expect(wall.Locator("[data-testid=wall-items-summary]")).ToContainTextAsync("1 of 2 done", new() { Timeout = 15_000 });
        output.WriteLine($"tick shown on the wall {clock.ElapsedMilliseconds} ms after the confirming tap");
        await Expect(card).ToHaveAttributeAsync("data-status", "done");
        await Expect(card.Locator("[data-testid=action-done-by]")).ToContainTextAsync(TestAccounts.Apron);
        browser.AssertNoCspViolationOrUncaughtError();

        server.Kill();

        var banner = tablet.Locator("[data-testid=actions-page] [data-testid=connection-banner]");
        await Expect(banner).ToBeVisibleAsync(new() { Timeout = 15_000 });
        await SaveAsync(tablet, "tablet-disconnected.png");
    }

    [BrowserFact]
    public async Task DutyManager_ConfirmsThePendingTransition_OnTheConsole_AndTheWallChangesPhase()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        await using var server = await OpsLvpServer.StartAsync(Variant(confirmActive: true));
        var wall = await browser.NewWallPageAsync();
        await WallBrowserTests.OpenLiveWallAsync(wall, server);
        var console = await browser.NewPageAsync(1600, 1000);
        await BrowserAccess.SignInAsync(console, server, TestAccounts.Manager, "/console");

        await server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 900), (Mid, "rvr", 950), (End, "rvr", 980), (Ceilometer, "cloud_base", 1000));
        await Expect(wall.Locator(PhaseTitle)).ToHaveTextAsync("LVP PREPARATION", new() { Timeout = 10_000 });
        // 400 m < active.rvrBelowM 550 m, but this profile variant makes preparation→active wait for the duty manager.
        await server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 400), (Mid, "rvr", 450), (End, "rvr", 500), (Ceilometer, "cloud_base", 1000));
        var confirm = console.Locator("[data-testid=console-confirm]");
        await Expect(confirm).ToBeVisibleAsync(new() { Timeout = 10_000 });
        await Expect(console.Locator("[data-testid=console-pending-text]")).ToContainTextAsync("LVP in force", new() { IgnoreCase = true });
        await Expect(wall.Locator(PhaseTitle)).ToHaveTextAsync("LVP PREPARATION");
        await SaveAsync(console, "console-pending.png");

        await confirm.ClickAsync();
        var dialog = console.Locator("[data-testid=reason-dialog]");
        await Expect(dialog).ToBeVisibleAsync();
        await console.Locator("[data-testid=reason-input] textarea, textarea[data-testid=reason-input]").FillAsync("RVR below the active threshold, confirmed (test)");
        await console.Locator("[data-testid=reason-submit]").ClickAsync();

        await Expect(wall.Locator(PhaseTitle)).ToHaveTextAsync("LVP IN FORCE", new() { Timeout = 5_000 });
        await Expect(console.Locator("[data-testid=console-confirm]")).ToHaveCountAsync(0, new() { Timeout = 5_000 });
        await SaveAsync(console, "console-active.png");
        browser.AssertNoCspViolationOrUncaughtError();
    }

    /// <summary>Every visible button or link on the page is at least <see cref="MinTargetPx"/> tall and wide.</summary>
    private async Task AssertTargetsFingerSizedAsync(IPage page)
    {
        var small = await page.EvaluateAsync<JsonElement>($$"""
            () => [...document.querySelectorAll('.tablet-actions button, .tablet-actions a, .tablet-actions [role=button]')]
              .filter(e => e.offsetParent !== null)
              .map(e => ({ text: e.textContent.trim().slice(0, 30), r: e.getBoundingClientRect() }))
              .filter(x => x.r.width < {{MinTargetPx}} || x.r.height < {{MinTargetPx}})
              .map(x => `${x.text} ${Math.round(x.r.width)}x${Math.round(x.r.height)}`)
            """);
        var list = small.EnumerateArray().Select(e => e.GetString()).ToList();
        Assert.True(list.Count == 0, $"touch targets smaller than {MinTargetPx} px at {page.ViewportSize?.Width}x{page.ViewportSize?.Height}: {string.Join(", ", list)}");
    }

    private async Task SaveAsync(IPage page, string name)
    {
        var path = Artifacts.PathFor(name);
        // The viewport as the person sees it (a full-page shot would draw the fixed header and safety line mid-page).
        await page.ScreenshotAsync(new() { Path = path });
        output.WriteLine($"screenshot: {path}");
    }
}
