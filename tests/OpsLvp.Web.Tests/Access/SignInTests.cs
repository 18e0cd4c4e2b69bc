using System.Net;
using Microsoft.AspNetCore.Identity;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Entities;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;
using SignInPage = OpsLvp.Web.Components.Pages.Account.SignIn;

namespace OpsLvp.Web.Tests.Access;

/// <summary>Sign-in, sign-out, lockout, setup and the audit of each, over real Kestrel with real forms.</summary>
public sealed class SignInTests
{
    [Fact]
    public async Task RightPassword_SetsAnHttpOnlyStrictSessionCookie_RedirectsToReturnUrl_AndIsAudited()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("r.test", Roles.DutyManager);
        using var client = AccessClient.For(app);

        using var response = await client.SignInAsync("r.test", AccessApp.Password, "/admin/users");

        Assert.Equal(HttpStatusCode.Redirect, response.StatusCode);
        Assert.Equal(new Uri(app.BaseAddress, "/admin/users"), new Uri(app.BaseAddress, response.Headers.Location!));
        var setCookie = response.Headers.GetValues("Set-Cookie").Single(c => c.StartsWith(AccessSchemes.SessionCookieName + "=", StringComparison.Ordinal));
        Assert.Contains("httponly", setCookie, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("samesite=strict", setCookie, StringComparison.OrdinalIgnoreCase);
        var entry = (await app.AuditAsync()).Last();
        Assert.Equal(AccessAuditKinds.SignIn, entry.Kind);
        Assert.Equal("r.test", entry.Actor);
    }

    [Fact]
    public async Task ReturnUrlToAnotherSite_IsIgnored()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("r.test", Roles.DutyManager);
        using var client = AccessClient.For(app);

        using var response = await client.SignInAsync("r.test", AccessApp.Password, "//evil.example/");

        Assert.Equal(new Uri(app.BaseAddress, "/"), new Uri(app.BaseAddress, response.Headers.Location!));
    }

    [Fact]
    public async Task WrongPassword_GivesNoCookie_AndIsAuditedAsAnonymous()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("r.test", Roles.DutyManager);
        using var client = AccessClient.For(app);

        using var response = await client.SignInAsync("r.test", "not-the-password-00");
        var html = WebUtility.HtmlDecode(await response.Content.ReadAsStringAsync());

        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        Assert.Contains(SignInPage.WrongCredentials, html, StringComparison.Ordinal);
        Assert.False(client.HasCookie(AccessSchemes.SessionCookieName));
        var entry = (await app.AuditAsync()).Last();
        Assert.Equal(AccessAuditKinds.SignInFailed, entry.Kind);
        Assert.Equal("anonymous", entry.Actor);
        Assert.Contains("\"userName\":\"r.test\"", entry.PayloadJson, StringComparison.Ordinal);
    }

    [Fact]
    public async Task DisabledAccount_CannotSignIn_AndGetsTheSameAnswerAsAWrongPassword()
    {
        await using var app = AccessApp.Start();
        var id = await app.CreateUserAsync("r.test", Roles.DutyManager);
        await app.WithAdminAsync(a => a.SetDisabledAsync("test-admin", id, true));
        using var client = AccessClient.For(app);

        using var response = await client.SignInAsync("r.test", AccessApp.Password);

        Assert.Contains(SignInPage.WrongCredentials, WebUtility.HtmlDecode(await response.Content.ReadAsStringAsync()), StringComparison.Ordinal);
        Assert.False(client.HasCookie(AccessSchemes.SessionCookieName));
    }

    [Fact]
    public async Task LockedAccount_GetsTheSameAnswerAsAWrongPassword()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("r.test", Roles.DutyManager);
        using (var scope = app.Services.CreateScope())
        {
            var users = scope.ServiceProvider.GetRequiredService<UserManager<OpsLvpUser>>();
            var user = await users.FindByNameAsync("r.test");
            await users.SetLockoutEndDateAsync(user!, DateTimeOffset.UtcNow.AddHours(1));
        }
        using var locked = AccessClient.For(app);
        using var guesser = AccessClient.For(app);

        using var lockedAnswer = await locked.SignInAsync("r.test", AccessApp.Password);
        using var wrongAnswer = await guesser.SignInAsync("r.test", "not-the-password-00");

        Assert.Equal(ErrorText(await lockedAnswer.Content.ReadAsStringAsync()), ErrorText(await wrongAnswer.Content.ReadAsStringAsync()));
        Assert.Equal(SignInPage.WrongCredentials, ErrorText(await lockedAnswer.Content.ReadAsStringAsync()));
        Assert.False(locked.HasCookie(AccessSchemes.SessionCookieName));
    }

    private static string ErrorText(string html)
    {
        var match = System.Text.RegularExpressions.Regex.Match(html, "data-testid=\"signin-error\">([^<]*)<");
        Assert.True(match.Success, "no sign-in error shown");
        return WebUtility.HtmlDecode(match.Groups[1].Value);
    }

    [Fact]
    public async Task SignOut_EndsTheSession_AndIsAudited()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("admin.test", Roles.Administrator);
        using var client = AccessClient.For(app);
        using var signedIn = await client.SignInAsync("admin.test", AccessApp.Password);
        using var before = await client.GetAsync("/admin/users");
        Assert.Equal(HttpStatusCode.OK, before.StatusCode);

        using var signedOut = await client.SignOutAsync();
        using var after = await client.GetAsync("/admin/users");

        Assert.Equal(HttpStatusCode.Redirect, after.StatusCode);
        Assert.StartsWith("/signin", after.Headers.Location?.AbsolutePath ?? after.Headers.Location?.OriginalString, StringComparison.Ordinal);
        Assert.Contains(await app.AuditAsync(), e => e.Kind == AccessAuditKinds.SignOut && e.Actor == "admin.test");
    }

    [Fact]
    public async Task Setup_RefusesAWrongSecret_CreatesTheFirstAdministrator_ThenCloses()
    {
        await using var app = AccessApp.Start();
        using var client = AccessClient.For(app);

        var wrong = await client.SetupAsync("wrong-secret-0123456789", "first.admin", AccessApp.Password);
        var right = await client.SetupAsync(AccessApp.SetupSecret, "first.admin", AccessApp.Password);
        var again = await client.GetAsync("/setup");

        Assert.Contains("the setup secret is wrong", wrong, StringComparison.Ordinal);
        Assert.Contains("setup is now closed", right, StringComparison.Ordinal);
        Assert.Contains("Setup is closed", WebUtility.HtmlDecode(await again.Content.ReadAsStringAsync()), StringComparison.Ordinal);
        using var signIn = await client.SignInAsync("first.admin", AccessApp.Password, "/admin/users");
        Assert.Equal(HttpStatusCode.Redirect, signIn.StatusCode);
        using var users = await client.GetAsync("/admin/users");
        Assert.Equal(HttpStatusCode.OK, users.StatusCode);
        Assert.Contains(await app.AuditAsync(), e => e.Kind == AccessAuditKinds.SetupAdministrator && e.Actor == "first.admin");
    }

    [Fact]
    public async Task ShortPassword_IsRefused_NamingTheRule()
    {
        await using var app = AccessApp.Start();

        var result = await app.WithAdminAsync(a => a.CreateAsync("test-admin", "short.pw", "Short (invented)", "elevenchars", [Roles.Viewer], []));

        Assert.False(result.Succeeded);
        Assert.Contains(result.Errors, e => e.Contains("12", StringComparison.Ordinal));
    }

    [Fact]
    public async Task GroundStaff_WithoutATeam_IsRefused()
    {
        await using var app = AccessApp.Start();

        var result = await app.WithAdminAsync(a => a.CreateAsync("test-admin", "no.team", "No Team (invented)", AccessApp.Password, [Roles.GroundStaff], []));

        Assert.False(result.Succeeded);
        Assert.Contains("ground staff must belong to at least one team", result.Errors);
    }
}
