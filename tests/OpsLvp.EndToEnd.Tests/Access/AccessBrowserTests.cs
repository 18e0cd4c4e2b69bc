using Microsoft.Playwright;
using OpsLvp.EndToEnd.Tests.Infrastructure;
using Xunit.Abstractions;
using static Microsoft.Playwright.Assertions;
using static OpsLvp.EndToEnd.Tests.Infrastructure.TestProfile;

namespace OpsLvp.EndToEnd.Tests.Access;

/// <summary>
/// Sign-in, lockout and page access in Chromium against one shared real app (the tests use different invented
/// accounts and do not interfere). Rules are docs/access.md's.
/// </summary>
public sealed class AccessBrowserTests(SharedServer shared, ITestOutputHelper output) : IClassFixture<SharedServer>
{
    private OpsLvpServer Server => shared.Server;

    private Task<IPage> NewPageAsync() => shared.Browser.NewPageAsync(1280, 900);

    private string Url(string path) => new Uri(Server.BaseAddress, path).ToString();

    [BrowserFact]
    public async Task SignIn_ThenSignOut_EndsTheSession()
    {
        var page = await NewPageAsync();
        await BrowserAccess.SignInAsync(page, Server, TestAccounts.Viewer, "/wall");
        await Expect(page.Locator("[data-testid=wall], [data-testid=wall-nodata]").First).ToBeVisibleAsync();

        await page.GotoAsync(Url("/signout"));
        await Expect(page.Locator("[data-testid=signout-user]")).ToHaveTextAsync(TestAccounts.Viewer);
        await page.Locator("[data-testid=signout-submit]").ClickAsync();
        await page.GotoAsync(Url("/signout"));
        await Expect(page.Locator("[data-testid=signed-out]")).ToBeVisibleAsync();

        await page.GotoAsync(Url("/wall"));
        await Expect(page).ToHaveURLAsync(new System.Text.RegularExpressions.Regex("/signin"));
    }

    [BrowserFact]
    public async Task FailedSignIns_GetOneAnswer_AndDoNotLockTheAccount()
    {
        var page = await NewPageAsync();
        // docs/access.md: throttling instead of lockout, and one answer for every refusal.
        for (var attempt = 1; attempt <= 6; attempt++)
        {
            await BrowserAccess.FillSignInAsync(page, Server, TestAccounts.Lockout, "wrong-password-" + attempt);
            await Expect(page.Locator("[data-testid=signin-error]")).ToContainTextAsync("The user name or password is wrong");
            await Expect(page.Locator("[data-testid=signin-error]")).Not.ToContainTextAsync("locked");
        }

        await BrowserAccess.FillSignInAsync(page, Server, TestAccounts.Lockout, TestAccounts.Password);
        // Generous wait (CI's shared cores): it proves the sign-in went through, not a speed.
        await page.WaitForURLAsync(url => new Uri(url).AbsolutePath == "/", new() { Timeout = 45_000 });
    }

    [BrowserFact]
    public async Task GroundStaff_SeeOnlyTheirOwnTeamsItems()
    {
        var page = await NewPageAsync();
        await BrowserAccess.SignInAsync(page, Server, TestAccounts.Lights, "/actions");
        // 900 m < preparation.rvrBelowM 1000 m (invented test profile): preparation, items for both teams.
        await Server.PushAsync(DateTimeOffset.UtcNow, (Tdz, "rvr", 900), (Mid, "rvr", 950), (End, "rvr", 980), (Ceilometer, "cloud_base", 1000));

        await Expect(page.Locator("[data-testid=action-item][data-item-id=prep-lights]")).ToBeVisibleAsync(new() { Timeout = 10_000 });
        await Expect(page.Locator("[data-testid=action-item]")).ToHaveCountAsync(1);
        await Expect(page.Locator("[data-testid=action-item][data-item-id=prep-works]")).ToHaveCountAsync(0);
    }

    [BrowserFact]
    public async Task Viewer_CannotReachTheConsole_AndSeesTheAccessDeniedPage()
    {
        var page = await NewPageAsync();
        await BrowserAccess.SignInAsync(page, Server, TestAccounts.Viewer);

        await page.GotoAsync(Url("/console"));

        Assert.Equal("/access-denied", new Uri(page.Url).AbsolutePath);
        await Expect(page.Locator("[data-testid=access-denied]")).ToBeVisibleAsync();
        await Expect(page.Locator("[data-testid=console-page]")).ToHaveCountAsync(0);
    }

    [BrowserFact]
    public async Task EveryPage_LoadsWithoutACspViolation_OrAnUncaughtError()
    {
        var anonymous = await NewPageAsync();
        await Visit(anonymous, "/signin", "[data-testid=signin-submit]");

        var kiosk = await shared.Browser.NewWallPageAsync();
        await BrowserAccess.OpenDisplayLinkAsync(kiosk, Server, "csp wall (invented)");
        await Visit(kiosk, "/wall", "[data-testid=wall], [data-testid=wall-nodata]");

        var manager = await NewPageAsync();
        await BrowserAccess.SignInAsync(manager, Server, TestAccounts.Manager, "/console");
        await Visit(manager, "/console", "[data-testid=console-page]");
        await Visit(manager, "/actions", "[data-testid=actions-page]");

        var admin = await NewPageAsync();
        await BrowserAccess.SignInAsync(admin, Server, TestAccounts.Admin, "/admin/users");
        await Visit(admin, "/admin/users", "[data-testid=users-table]");
        await Visit(admin, "/review", "[data-testid=review-chain], [data-testid=episode-list]");

        foreach (var error in shared.Browser.ConsoleErrors)
        {
            output.WriteLine("console error: " + error);
        }
        shared.Browser.AssertNoCspViolationOrUncaughtError();
    }

    /// <summary>Opens <paramref name="path"/>, waits for <paramref name="shown"/> and for the interactive circuit to settle.</summary>
    private async Task Visit(IPage page, string path, string shown)
    {
        var response = await page.GotoAsync(Url(path), new() { WaitUntil = WaitUntilState.NetworkIdle });
        Assert.True(response is { Ok: true }, $"GET {path} answered {response?.Status}");
        await Expect(page.Locator(shown).First).ToBeVisibleAsync(new() { Timeout = 10_000 });
        await page.WaitForTimeoutAsync(1_000); // scripts that run after the first render
        output.WriteLine($"visited {path}");
    }
}
