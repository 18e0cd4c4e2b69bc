using System.Net;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;
using SignInPage = OpsLvp.Web.Components.Pages.Account.SignIn;

namespace OpsLvp.Web.Tests.Access;

/// <summary>Sign-in throttling per client address and per account, instead of an account lockout (docs/access.md).</summary>
public sealed class SignInThrottleTests
{
    private static async Task<string> PageTextAsync(HttpResponseMessage response) => WebUtility.HtmlDecode(await response.Content.ReadAsStringAsync());

    private static async Task<string> SignInTextAsync(AccessClient client, string userName, string password)
    {
        using var response = await client.SignInAsync(userName, password);
        return await PageTextAsync(response);
    }

    [Fact]
    public async Task PostsBeyondThePerAddressLimit_Get429()
    {
        await using var app = AccessApp.Start(new Dictionary<string, string?> { ["Access:SignInPerAddressPerMinute"] = "3" });
        using var client = AccessClient.For(app);

        for (var i = 0; i < 3; i++)
        {
            using var allowed = await client.SignInAsync("nobody.here", "not-the-password-00");
            Assert.Equal(HttpStatusCode.OK, allowed.StatusCode);
        }
        using var refused = await client.SignInAsync("nobody.here", "not-the-password-00");

        Assert.Equal(HttpStatusCode.TooManyRequests, refused.StatusCode);
        Assert.Equal("60", refused.Headers.GetValues("Retry-After").Single());
    }

    [Fact]
    public async Task AGuesserCannotLockTheDutyManagerOut_TheGuesserIsThrottled_NotTheAccount()
    {
        await using var app = AccessApp.Start(new Dictionary<string, string?> { ["Access:SignInAttemptsPerAccount"] = "3" });
        await app.CreateUserAsync("dm.target", Roles.DutyManager);
        using var guesser = AccessClient.For(app);

        for (var i = 0; i < 10; i++)
        {
            (await guesser.SignInAsync("dm.target", "guess-" + i + "-padding")).Dispose();
        }
        using var guesserWithTheRightPassword = await guesser.SignInAsync("dm.target", AccessApp.Password);
        Assert.Contains(SignInPage.Throttled, await PageTextAsync(guesserWithTheRightPassword), StringComparison.Ordinal);
        Assert.False(guesser.HasCookie(AccessSchemes.SessionCookieName));

        // The duty manager at another address (127.0.0.2 is loopback on Linux) still signs in at once.
        using var dutyManager = AccessClient.For(app, localAddress: IPAddress.Parse("127.0.0.2"));
        using var signedIn = await dutyManager.SignInAsync("dm.target", AccessApp.Password);
        Assert.Equal(HttpStatusCode.Redirect, signedIn.StatusCode);
        Assert.True(dutyManager.HasCookie(AccessSchemes.SessionCookieName));
    }

    /// <summary>
    /// A guesser spread over many client addresses (127.0.0.0/8 is loopback on Linux) meets the per-account limit across
    /// all addresses, which is higher than the per-address one; the answer is the same throttle message as from one
    /// address. The duty manager at an address the account signed in from before is not held by it.
    /// </summary>
    [Fact]
    public async Task AGuesserOnManyAddresses_MeetsTheAccountWideLimit_ButTheDutyManagersKnownAddressDoesNot()
    {
        await using var app = AccessApp.Start(new Dictionary<string, string?>
        {
            ["Access:SignInAttemptsPerAccount"] = "2",
            ["Access:SignInAttemptsPerAccountAllAddresses"] = "5",
        });
        await app.CreateUserAsync("dm.target", Roles.DutyManager);
        using (var earlier = AccessClient.For(app, localAddress: IPAddress.Parse("127.0.0.30")))
        {
            using var first = await earlier.SignInAsync("dm.target", AccessApp.Password);
            Assert.Equal(HttpStatusCode.Redirect, first.StatusCode);
        }

        var wrong = 0;
        var throttled = 0;
        for (var host = 2; host <= 7; host++)
        {
            using var guesser = AccessClient.For(app, localAddress: IPAddress.Parse($"127.0.0.{host}"));
            for (var i = 0; i < 2; i++)
            {
                var text = await SignInTextAsync(guesser, "dm.target", $"guess-{host}-{i}-padding");
                wrong += text.Contains(SignInPage.WrongCredentials, StringComparison.Ordinal) ? 1 : 0;
                throttled += text.Contains(SignInPage.Throttled, StringComparison.Ordinal) ? 1 : 0;
            }
        }
        // 5 of the account's attempts (the first sign-in took one) reached the password check, 1 + 4 wrong; the rest were throttled.
        Assert.Equal(4, wrong);
        Assert.Equal(12 - 4, throttled);

        // The right password from an address that never tried is throttled too: nothing tells a guesser it was right.
        using var fresh = AccessClient.For(app, localAddress: IPAddress.Parse("127.0.0.20"));
        Assert.Contains(SignInPage.Throttled, await SignInTextAsync(fresh, "dm.target", AccessApp.Password), StringComparison.Ordinal);
        Assert.False(fresh.HasCookie(AccessSchemes.SessionCookieName));

        // The duty manager's own workstation, where the account signed in before, still signs in at once.
        using var dutyManager = AccessClient.For(app, localAddress: IPAddress.Parse("127.0.0.30"));
        using var signedIn = await dutyManager.SignInAsync("dm.target", AccessApp.Password);
        Assert.Equal(HttpStatusCode.Redirect, signedIn.StatusCode);
        Assert.True(dutyManager.HasCookie(AccessSchemes.SessionCookieName));
    }

    [Fact]
    public async Task OverlongUserName_IsRefusedBeforeAnythingIsStored()
    {
        await using var app = AccessApp.Start();
        var before = (await app.AuditAsync()).Count;
        using var client = AccessClient.For(app);

        using var response = await client.SignInAsync(new string('x', 16 * 1024 / 2), "not-the-password-00");

        Assert.Contains($"A user name has at most {SignInLimits.MaxUserNameLength} characters.", await PageTextAsync(response), StringComparison.Ordinal);
        Assert.Equal(before, (await app.AuditAsync()).Count);
    }

    [Fact]
    public async Task FailedSignInsUnderLoad_AreAuditedInBoundedForm_WithNothingUncounted()
    {
        await using var app = AccessApp.Start();
        var before = (await app.AuditAsync()).Count;
        var failures = 25;
        using var client = AccessClient.For(app);

        for (var i = 0; i < failures; i++)
        {
            (await client.SignInAsync("nobody." + i, "not-the-password-00")).Dispose();
        }
        await app.Services.GetRequiredService<SignInFailureAudit>().FlushAsync(all: true);

        var entries = (await app.AuditAsync()).Skip(before).ToList();
        var single = entries.Count(e => e.Kind == AccessAuditKinds.SignInFailed);
        var summed = entries.Where(e => e.Kind == AccessAuditKinds.SignInFailedSummary)
            .Sum(e => System.Text.Json.JsonDocument.Parse(e.PayloadJson).RootElement.GetProperty("count").GetInt32());
        Assert.Equal(failures, single + summed);
        // At most 10 single entries per minute, and the test may straddle one minute boundary.
        Assert.InRange(single, SignInFailureAudit.DetailedPerMinute, 2 * SignInFailureAudit.DetailedPerMinute);
        Assert.True(entries.Count <= 2 * SignInFailureAudit.DetailedPerMinute + 2, $"{entries.Count} audit entries for {failures} failures");
    }
}
