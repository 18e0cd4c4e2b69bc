using Microsoft.Playwright;
using OpsLvp.Core.Presentation;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Screens;

/// <summary>
/// Issue 13 "Console that answers" in a real Chromium at 1440×900 against the real app: a command is told in a toast,
/// and "Cancel LVP" while the conditions still call for LVP shows the values beside the recovery thresholds and asks a
/// second time (docs/engine.md R15, R40). Readings are invented; the thresholds are the invented test profile's, with
/// entry dwells of 30 s here so a cancel is not undone in the same instant.
/// </summary>
public sealed class ConsoleBrowserTests(ITestOutputHelper output)
{
    private static readonly string Profile = Json.Replace("\"enterDwellSeconds\": 0", "\"enterDwellSeconds\": 30", StringComparison.Ordinal);

    [BrowserFact]
    public async Task CancelLvp_AgainstTheConditions_ShowsValuesBesideThresholds_AsksTwice_AndEachCommandIsToldInAToast()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        await using var server = await OpsLvpServer.StartAsync(Profile);
        var console = await browser.NewPageAsync(1440, 900);
        await BrowserAccess.SignInAsync(console, server, TestAccounts.Manager, "/console");
        // 400 m: below active.rvrBelowM 550 m (invented); ceiling 1000 ft is above every ceiling threshold
        await PushFogAsync(server);
        await Expect(console.Locator("[data-testid=console-cancel]")).ToBeVisibleAsync(new() { Timeout = 20_000 });
        // The buttons are already in the prerendered page; a click before the live circuit is up is lost (two clean-clone
        // runs under load did that). The pushed 400 m can only arrive through the circuit: once it shows, clicks count.
        await Expect(console.Locator("[data-testid=console-condition]")).ToContainTextAsync("400 m at 09 TDZ", new() { Timeout = 45_000 });

        // A command and its toast: declare LVP in force (a hold) rather than wait for the entry dwell.
        await console.Locator("[data-testid=console-declare-active]").ClickAsync();
        // Generous waits (CI's shared cores, one clean-clone run needed more than 10 s): they prove it opens, not a speed.
        await Expect(console.Locator("[data-testid=reason-effect]")).ToContainTextAsync("LVP in force", new() { Timeout = 45_000 });
        await console.Locator("[data-testid=reason-dialog] textarea").FillAsync("fog bank on the approach (invented)");
        await console.Locator("[data-testid=reason-submit]").ClickAsync();
        await Expect(console.Locator(".mud-snackbar").Filter(new() { HasText = "Declare LVP in force: done" })).ToBeVisibleAsync(new() { Timeout = 20_000 });
        await Expect(console.Locator("[data-testid=console-phase]")).ToHaveTextAsync(LvpVocabulary.Of(LvpState.InForce).Headline, new() { Timeout = 20_000 });

        await PushFogAsync(server);
        await console.Locator("[data-testid=console-cancel]").ClickAsync();
        // the test id sits on the dialog's content; its buttons are the page's only reason-submit
        var dialog = console.Locator("[data-testid=reason-dialog]");
        await Expect(dialog).ToBeVisibleAsync(new() { Timeout = 45_000 });
        // the reason box has the focus and is not shown invalid before anything is typed
        await Expect(dialog.Locator("textarea")).ToBeFocusedAsync(new() { Timeout = 10_000 });
        await Expect(dialog.Locator(".mud-input-error")).ToHaveCountAsync(0);
        // what the cancel acts against, beside the thresholds
        await Expect(Fact(dialog, "RVR 09 TDZ")).ToContainTextAsync("400 m");
        await Expect(Fact(dialog, "RVR 09 MID")).ToContainTextAsync("450 m");
        await Expect(Fact(dialog, "RVR 09 END")).ToContainTextAsync("500 m");
        await Expect(Fact(dialog, "Ceiling")).ToContainTextAsync("1000 ft");
        await Expect(Fact(dialog, "LVP in force recovers at RVR")).ToContainTextAsync("650 m or more");
        await Expect(Fact(dialog, "LVP in force recovers at ceiling")).ToContainTextAsync("250 ft or more");
        await Expect(dialog.Locator("[data-testid=reason-verdict]")).ToHaveTextAsync("Conditions still call for LVP in force.");

        await dialog.Locator("textarea").FillAsync("tower reports improving (invented)");
        await console.Locator("[data-testid=reason-submit]").ClickAsync();
        // the second ask: still open, words saying the conditions still call for LVP, nothing sent yet
        await Expect(dialog.Locator("[data-testid=reason-second-ask]")).ToContainTextAsync("The conditions still call for LVP in force");
        await Expect(console.Locator("[data-testid=reason-submit]")).ToHaveTextAsync("Cancel LVP against the conditions");
        await Expect(console.Locator("[data-testid=console-phase]")).ToHaveTextAsync(LvpVocabulary.Of(LvpState.InForce).Headline);
        await SaveAsync(console, "console-cancel-second-ask.png");

        await console.Locator("[data-testid=reason-submit]").ClickAsync();
        await Expect(console.Locator(".mud-snackbar").Filter(new() { HasText = "Cancel LVP: done — LVP cancelled" })).ToBeVisibleAsync(new() { Timeout = 20_000 });
        await Expect(console.Locator("[data-testid=console-phase]")).ToHaveTextAsync(LvpVocabulary.Of(LvpState.Cancellation).Headline, new() { Timeout = 20_000 });
        browser.AssertNoCspViolationOrUncaughtError();
    }

    private static ILocator Fact(ILocator dialog, string label) =>
        dialog.Locator("[data-testid=reason-fact]").Filter(new() { Has = dialog.Page.Locator("th", new() { HasTextString = label }) }).First;

    private static Task PushFogAsync(OpsLvpServer server) =>
        server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 400), (Mid, "rvr", 450), (End, "rvr", 500), (Ceilometer, "cloud_base", 1000));

    private async Task SaveAsync(IPage page, string name)
    {
        var path = Artifacts.PathFor(name);
        await page.ScreenshotAsync(new() { Path = path });
        output.WriteLine($"screenshot: {path}");
    }
}
