using System.Net;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using OpsLvp.FaultCases;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Screens;

/// <summary>
/// Not recording with protective-action items open, on the wall, the duty console and the team page at the four screen
/// sizes of docs/screens.md (<see cref="ScreenMeasure"/>): a real storage fault (the data folder a small tmpfs, filled;
/// docs/reliability.md "Storage faults") in LVP preparation. The phase and its note "phase as last recorded before …"
/// are in view and not cut off, no tick button looks as if a tick could be recorded, and a tick sent from a confirmation
/// opened before the fault is refused with its reason, the item still open. Readings, people and items are the invented
/// test profile's.
/// </summary>
public sealed class NotRecordingScreensBrowserTests(ITestOutputHelper output)
{
    private const string Banner = "[data-testid=not-recording]";

    /// <summary>The safety line (README, and the project's rule that the UI says it): on every page, whole and in view.</summary>
    private const string Safety = "[data-testid=safety-line]";

    /// <summary>The wall's safety line without the signed-in name beside it (small on purpose: it is not read across the room).</summary>
    private const string WallSafety = "[data-testid=safety-line] .opslvp-wall-safety-text";

    private const string SafetyWords = "does not replace|Demo thresholds are illustrative";

    [BrowserRootFact]
    public async Task NotRecordingWithOpenItems_EveryScreenAtEverySize_SaysThePhaseIsTheLastRecorded_AndOffersNoTickThatWouldBeLost()
    {
        using var fs = SmallMount.Mount(Path.Combine(Path.GetTempPath(), "opslvp-e2e", Guid.NewGuid().ToString("N")), 32);
        await using var browser = await BrowserSession.LaunchAsync();
        await using var server = await OpsLvpServer.StartOnFolderAsync(fs.Root);
        var wall = await browser.NewWallPageAsync();
        await Wall.WallBrowserTests.OpenLiveWallAsync(wall, server);
        var console = await browser.NewPageAsync(1440, 900, touch: true);
        await BrowserAccess.SignInAsync(console, server, TestAccounts.Manager, "/console");
        var tablet = await browser.NewPageAsync(1024, 768, touch: true);
        await BrowserAccess.SignInAsync(tablet, server, TestAccounts.Apron, "/actions");
        var phone = await browser.NewPageAsync(390, 844, touch: true);
        await BrowserAccess.SignInAsync(phone, server, TestAccounts.Lights, "/actions");

        // Below the preparation threshold (1000 m, invented): LVP preparation, "prep-works" (apron) and "prep-lights" open.
        var t = DateTimeOffset.UtcNow.AddSeconds(-30);
        await server.PushAsync(t, (Tdz, "rvr", 900), (Mid, "rvr", 950), (End, "rvr", 980), (Ceilometer, "cloud_base", 1000));
        var works = tablet.Locator("[data-testid=action-item][data-item-id=prep-works]");
        var lights = phone.Locator("[data-testid=action-item][data-item-id=prep-lights]");
        await Expect(works).ToHaveAttributeAsync("data-status", "open", new() { Timeout = 30_000 });
        await Expect(lights).ToHaveAttributeAsync("data-status", "open", new() { Timeout = 30_000 });
        // the lighting crew starts a tick before the fault: the confirmation is open when recording stops
        await lights.Locator("[data-testid=action-tick]").TapAsync();
        await Expect(lights.Locator("[data-testid=action-confirm-yes]")).ToBeVisibleAsync();

        // fill the folder, pushing until the server refuses (503: it cannot store them)
        fs.Fill();
        var refused = false;
        for (var i = 0; i < 2000 && !refused; i++)
        {
            t = t.AddMilliseconds(5);
            var (status, text) = await server.TryPushAsync(t, (Tdz, "rvr", 890), (Mid, "rvr", 940), (End, "rvr", 970));
            refused = status == HttpStatusCode.ServiceUnavailable;
            Assert.True(refused || status == HttpStatusCode.Accepted, $"push answered {(int)status}: {text}");
        }
        Assert.True(refused, "the full folder never made the server refuse a push");
        foreach (var page in new[] { wall, console, tablet, phone })
        {
            await Expect(page.Locator(Banner)).ToBeVisibleAsync(new() { Timeout = 30_000 });
        }

        const string note = "phase as last recorded before";
        var problems = new List<string>();
        foreach (var size in ScreenMeasure.Sizes)
        {
            var touch = size.Width <= 1024;
            await ScreenMeasure.ShowAtAsync(wall, size, $"not-recording-wall-page-at-{size.Name}.png", output);
            problems.AddRange(await ScreenMeasure.ProblemsAsync(wall, $"wall page at {size.Name}", "[data-testid=wall-phase]",
                [("[data-testid=wall-phase-note]", note), (Banner, "NOT RECORDING since"), (WallSafety, SafetyWords)], wall: size.Name == "wall", touch,
                ["[data-testid=wall-phase-note]", Banner, WallSafety]));
            problems.AddRange(await ScreenMeasure.ContentReachableAsync(wall, $"wall page at {size.Name}"));
            await ScreenMeasure.ShowAtAsync(console, size, $"not-recording-console-page-at-{size.Name}.png", output);
            problems.AddRange(await ScreenMeasure.ProblemsAsync(console, $"console page at {size.Name}", "[data-testid=console-phase]",
                [("[data-testid=console-phase-note]", note), (Banner, "NOT RECORDING since"), (Safety, SafetyWords)], wall: false, touch,
                ["[data-testid=console-phase-note]", Banner, Safety]));
            problems.AddRange(await ScreenMeasure.ContentReachableAsync(console, $"console page at {size.Name}"));
            await ScreenMeasure.ShowAtAsync(tablet, size, $"not-recording-team-page-at-{size.Name}.png", output);
            problems.AddRange(await ScreenMeasure.ProblemsAsync(tablet, $"team page at {size.Name}", "[data-testid=actions-phase]",
                [("[data-testid=actions-phase-note]", note), (Banner, "NOT RECORDING since"),
                 ("[data-item-id=prep-works] [data-testid=action-not-recording]", "NOT RECORDING since|cannot be recorded now"), (Safety, SafetyWords)], wall: false, touch,
                ["[data-testid=actions-phase-note]", Banner, Safety]));
            problems.AddRange(await ScreenMeasure.ContentReachableAsync(tablet, $"team page at {size.Name}"));
            // no tick button that looks as if it would be recorded
            await Expect(works.Locator("[data-testid=action-tick]")).ToBeDisabledAsync();
            await Expect(works.Locator("[data-testid=action-tick]")).ToContainTextAsync("not recording");
        }
        // The tick confirmed from the confirmation opened before the fault: refused, with the reason, the item still open.
        await ScreenMeasure.ShowAtAsync(phone, ScreenMeasure.Sizes[^1], "not-recording-team-page-confirming-at-phone.png", output);
        await Expect(lights.Locator("[data-testid=action-confirm] [data-testid=action-not-recording]")).ToContainTextAsync("would be refused");
        await lights.Locator("[data-testid=action-confirm-yes]").TapAsync();
        await Expect(lights.Locator("[data-testid=action-message]")).ToContainTextAsync("not recording since", new() { Timeout = 30_000 });
        await Expect(lights).ToHaveAttributeAsync("data-status", "open", new() { Timeout = 30_000 });
        await ScreenMeasure.ShowAtAsync(phone, ScreenMeasure.Sizes[^1], "not-recording-team-page-refused-at-phone.png", output);
        problems.AddRange(await ScreenMeasure.ProblemsAsync(phone, "team page at phone, tick refused", "",
            [("[data-item-id=prep-lights] [data-testid=action-message]", "not recording since")], wall: false, touch: true));
        output.WriteLine("refusal shown: " + await lights.Locator("[data-testid=action-message]").InnerTextAsync());
        Assert.True(problems.Count == 0, string.Join(Environment.NewLine, problems));

        // space returns: the server records again, and the tick button is offered again
        fs.Free();
        var deadline = DateTime.UtcNow.AddSeconds(60);
        while (true)
        {
            t = t.AddMilliseconds(5);
            var (status, _) = await server.TryPushAsync(t, (Tdz, "rvr", 880), (Mid, "rvr", 930), (End, "rvr", 960));
            if (status == HttpStatusCode.Accepted)
            {
                break;
            }
            Assert.True(DateTime.UtcNow < deadline, "recording did not resume within 60 s of space returning");
            await Task.Delay(250);
        }
        await Expect(tablet.Locator(Banner)).ToHaveCountAsync(0, new() { Timeout = 30_000 });
        await Expect(works.Locator("[data-testid=action-tick]")).ToBeEnabledAsync();
        await Expect(works.Locator("[data-testid=action-not-recording]")).ToHaveCountAsync(0);
        browser.AssertNoCspViolationOrUncaughtError();
    }
}
