using System.Text.Json;
using Microsoft.Playwright;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.EndToEnd.Tests.Wall;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Capability;

/// <summary>
/// Runway capability in Chromium against the real app (docs/capability.md): the lighting crew's tablet marks a facility
/// unserviceable and the wall's capability panel changes. The profile is the invented test profile with an invented,
/// illustrative capability section (TestProfile.WithCapability: CAT I and CAT II on 09, both needing the ILS and the approach lights).
/// </summary>
public sealed class CapabilityBrowserTests(ITestOutputHelper output)
{
    /// <summary>Finger-sized touch target (WCAG 2.2 target size guidance and common practice for gloved use: 48 px).</summary>
    private const double MinTargetPx = 48;

    [BrowserFact]
    public async Task LightingCrewMarksTheApproachLightsUnserviceable_OnTheTablet_AndTheWallsCapabilityChanges()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        await using var server = await OpsLvpServer.StartAsync(WithCapability(Json));
        var wall = await browser.NewWallPageAsync();
        await WallBrowserTests.OpenLiveWallAsync(wall, server);
        var tablet = await browser.NewPageAsync(800, 1280, touch: true);
        await BrowserAccess.SignInAsync(tablet, server, TestAccounts.Lights, "/actions");

        // 900 m at TDZ is above the invented CAT I minimum of 550 m: CAT I available on 09
        await server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 900), (Mid, "rvr", 950), (End, "rvr", 980), (Ceilometer, "cloud_base", 1000));
        var row = wall.Locator("[data-testid=wall-cap-row][data-direction='09']");
        await Expect(row.Locator("[data-testid=wall-cap-best]")).ToHaveTextAsync("CAT I", new() { Timeout = 15_000 });

        // the lighting crew sees its own facility only (the ILS is the apron desk's)
        var lights = tablet.Locator("[data-testid=facility-pick][data-facility='als-09']");
        await Expect(lights).ToBeVisibleAsync(new() { Timeout = 15_000 });
        await Expect(tablet.Locator("[data-testid=facility-pick][data-facility='ils-09']")).ToHaveCountAsync(0);
        await AssertFingerSizedAsync(tablet);

        await lights.TapAsync();
        await tablet.Locator("[data-testid=facility-status][data-status=unserviceable]").TapAsync();
        await AssertFingerSizedAsync(tablet);
        await tablet.Locator("[data-testid=facility-reason-step] input").FillAsync("feeder cable cut (invented)");
        await tablet.Locator("[data-testid=facility-send]").TapAsync();

        await Expect(tablet.Locator("[data-testid=facility-message]")).ToHaveTextAsync("Reported: Approach lights 09 unserviceable", new() { Timeout = 15_000 });
        await Expect(row.Locator("[data-testid=wall-cap-best]")).ToHaveTextAsync("no CAT approach", new() { Timeout = 15_000 });
        await Expect(row.Locator("[data-testid=wall-cap-reason]")).ToContainTextAsync("Approach lights 09 unserviceable (feeder cable cut (invented))");
        await Expect(lights.Locator("[data-testid=facility-state]")).ToContainTextAsync("unserviceable: feeder cable cut (invented)");
        var path = Artifacts.PathFor("capability-wall-after-tablet-report.png");
        await wall.ScreenshotAsync(new() { Path = path });
        output.WriteLine($"screenshot: {path}");
        browser.AssertNoCspViolationOrUncaughtError();
    }

    /// <summary>Every visible button of the facility report is at least <see cref="MinTargetPx"/> tall and wide.</summary>
    private static async Task AssertFingerSizedAsync(IPage page)
    {
        var sizes = await page.EvaluateAsync<JsonElement>("""
            () => [...document.querySelectorAll('[data-testid=facility-report] button')]
              .filter(e => e.offsetParent !== null)
              .map(e => { const r = e.getBoundingClientRect(); return { text: e.textContent.trim().slice(0, 30), w: r.width, h: r.height }; })
            """);
        var all = sizes.EnumerateArray().ToList();
        Assert.NotEmpty(all);
        var small = all.Where(s => s.GetProperty("w").GetDouble() < MinTargetPx || s.GetProperty("h").GetDouble() < MinTargetPx)
            .Select(s => $"{s.GetProperty("text").GetString()} {s.GetProperty("w").GetDouble():0}x{s.GetProperty("h").GetDouble():0}")
            .ToList();
        Assert.True(small.Count == 0, $"facility report targets smaller than {MinTargetPx} px: {string.Join(", ", small)}");
    }
}
