using Microsoft.Playwright;
using OpsLvp.Core.Presentation;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Screens;

/// <summary>
/// Issue 13 on a 1024×768 touch tablet in Chromium: a ticked card does not move under the finger, and done items of an
/// earlier phase fold into a collapsed section once the hold is over. Readings, items and people are the invented
/// test profile's.
/// </summary>
public sealed class TabletHoldBrowserTests
{
    private const string GridCards = "[data-testid=actions-grid] > [data-testid=action-item]";

    [BrowserFact]
    public async Task TickedCard_StaysWhereTheFingerWas_ThenTheListSorts_AndEarlierPhaseItemsFoldAway()
    {
        await using var browser = await BrowserSession.LaunchAsync();
        // a 20 s hold (Screens:TabletCardHold) so a loaded machine still sees the card before the hold ends
        await using var server = await OpsLvpServer.StartAsync(settings: new Dictionary<string, string> { ["Screens__TabletCardHold"] = "00:00:20" });
        var tablet = await browser.NewPageAsync(1024, 768, touch: true);
        await BrowserAccess.SignInAsync(tablet, server, TestAccounts.Apron, "/actions");

        // below the preparation and in-force thresholds (invented): the apron team has a preparation and an in-force item
        await server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 900), (Mid, "rvr", 950), (End, "rvr", 980), (Ceilometer, "cloud_base", 1000));
        await Expect(tablet.Locator("[data-testid=actions-phase]")).ToHaveTextAsync(LvpVocabulary.Of(LvpState.Preparation).Headline, new() { Timeout = 30_000 });
        await server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 400), (Mid, "rvr", 450), (End, "rvr", 500), (Ceilometer, "cloud_base", 1000));
        await Expect(tablet.Locator("[data-testid=actions-phase]")).ToHaveTextAsync(LvpVocabulary.Of(LvpState.InForce).Headline, new() { Timeout = 30_000 });
        await Expect(tablet.Locator(GridCards)).ToHaveCountAsync(2, new() { Timeout = 30_000 });
        // the in-force item is due first (10 min after LVP came in force, against 20 min after preparation began)
        Assert.Equal(["act-areas", "prep-works"], await IdsAsync(tablet));

        var first = tablet.Locator("[data-item-id=act-areas]");
        var before = await first.BoundingBoxAsync();
        await first.Locator("[data-testid=action-tick]").TapAsync();
        await tablet.Locator("[data-testid=action-confirm-yes]").TapAsync();
        await Expect(first).ToHaveAttributeAsync("data-status", "done", new() { Timeout = 30_000 });

        // done, and still where the finger was: a done card would sort after the open one
        var after = await first.BoundingBoxAsync();
        Assert.Equal(["act-areas", "prep-works"], await IdsAsync(tablet));
        Assert.NotNull(before);
        Assert.NotNull(after);
        Assert.Equal(before.X, after.X, 1.0);
        Assert.Equal(before.Y, after.Y, 1.0);

        // the hold ends: the open item comes first
        await Expect(tablet.Locator(GridCards).First).ToHaveAttributeAsync("data-item-id", "prep-works", new() { Timeout = 60_000 });

        // the preparation item done while LVP are in force folds into the collapsed "done" section after its hold
        var prep = tablet.Locator("[data-item-id=prep-works]");
        await prep.Locator("[data-testid=action-tick]").TapAsync();
        await tablet.Locator("[data-testid=action-confirm-yes]").TapAsync();
        await Expect(prep).ToHaveAttributeAsync("data-status", "done", new() { Timeout = 30_000 });
        var section = tablet.Locator("[data-testid=actions-done-earlier]");
        await Expect(section.Locator("[data-item-id=prep-works]")).ToHaveCountAsync(1, new() { Timeout = 60_000 });
        Assert.Equal(["act-areas"], await IdsAsync(tablet));
        await Expect(section).Not.ToHaveAttributeAsync("open", "");
        await Expect(section.Locator("[data-item-id=prep-works]")).ToBeHiddenAsync();
        var summary = tablet.Locator("[data-testid=actions-done-earlier-summary]");
        Assert.True((await summary.BoundingBoxAsync())!.Height >= 48, "the done section's summary is smaller than a finger");
        await summary.TapAsync();
        await Expect(section.Locator("[data-item-id=prep-works]")).ToBeVisibleAsync();
        browser.AssertNoCspViolationOrUncaughtError();
    }

    private static async Task<string[]> IdsAsync(IPage page) =>
        await page.Locator(GridCards).EvaluateAllAsync<string[]>("cards => cards.map(c => c.dataset.itemId)");
}
