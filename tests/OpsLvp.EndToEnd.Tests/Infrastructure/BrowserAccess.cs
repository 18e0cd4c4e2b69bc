using Microsoft.Playwright;
using static Microsoft.Playwright.Assertions;

namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>Signing a Playwright page in as an invented account, and opening the wall through a display link.</summary>
public static class BrowserAccess
{
    /// <summary>Signs <paramref name="page"/> in through /signin and waits until it has left the sign-in page for <paramref name="returnPath"/>.</summary>
    public static async Task SignInAsync(IPage page, OpsLvpServer server, string userName, string returnPath = "/")
    {
        await FillSignInAsync(page, server, userName, TestAccounts.Password, returnPath);
        // Generous: the first sign-in on a fresh server (password hash, first render of the page) shares CI's two cores
        // with the other test projects; a 15 s wait once ran out there. The wait proves the redirect, not a speed.
        try
        {
            await page.WaitForURLAsync(url => new Uri(url).AbsolutePath == returnPath, new() { Timeout = 45_000 });
        }
        catch (TimeoutException ex)
        {
            throw new TimeoutException($"sign-in as {userName} did not reach {returnPath} within 45 s; the page is at {page.Url}; server output:{Environment.NewLine}{server.Output}", ex);
        }
    }

    /// <summary>Submits the sign-in form once with <paramref name="password"/> (right or wrong); does not wait for the outcome.</summary>
    public static async Task FillSignInAsync(IPage page, OpsLvpServer server, string userName, string password, string returnPath = "/")
    {
        var response = await page.GotoAsync(new Uri(server.BaseAddress, "/signin?returnUrl=" + Uri.EscapeDataString(returnPath)).ToString());
        Assert.True(response is { Ok: true }, $"GET /signin answered {response?.Status}; server output:{Environment.NewLine}{server.Output}");
        await page.Locator("[data-testid=signin-user]").FillAsync(userName);
        await page.Locator("[data-testid=signin-password]").FillAsync(password);
        await page.Locator("[data-testid=signin-submit]").ClickAsync();
    }

    /// <summary>Issues a display link (the app's own store) and opens it: the page lands on /wall as a kiosk.</summary>
    public static async Task OpenDisplayLinkAsync(IPage page, OpsLvpServer server, string name = "e2e wall (invented)")
    {
        var link = await server.Accounts.IssueDisplayLinkAsync(name);
        var response = await page.GotoAsync(new Uri(server.BaseAddress, link).ToString());
        Assert.True(response is { Ok: true }, $"GET {link} answered {response?.Status}; server output:{Environment.NewLine}{server.Output}");
        await Expect(page).ToHaveURLAsync(new Uri(server.BaseAddress, "/wall").ToString());
    }
}
