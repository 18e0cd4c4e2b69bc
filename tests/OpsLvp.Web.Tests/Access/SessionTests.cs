using System.Net;
using Microsoft.AspNetCore.Identity;
using Microsoft.AspNetCore.SignalR.Client;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Entities;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Access;

/// <summary>
/// A session ends on the server, not only in the browser: a copied cookie stops working at once after sign-out,
/// a password change or a role change, and idle and absolute timeouts come from configuration (docs/access.md).
/// </summary>
public sealed class SessionTests
{
    /// <summary>Long enough that Identity's interval check cannot be what ends the session in these tests.</summary>
    private static readonly Dictionary<string, string?> s_slowRevalidation = new() { ["Access:RevalidationInterval"] = "00:01:00" };

    /// <summary>A second client carrying only a copy of <paramref name="person"/>'s session cookie, as an attacker would.</summary>
    private static HttpClient CopyOf(OpsLvpApp app, AccessClient person)
    {
        var cookie = person.Cookies.GetAllCookies().Single(c => c.Name == AccessSchemes.SessionCookieName);
        var copy = new HttpClient(new HttpClientHandler { UseCookies = false, AllowAutoRedirect = false }) { BaseAddress = app.BaseAddress };
        copy.DefaultRequestHeaders.Add("Cookie", $"{cookie.Name}={cookie.Value}");
        return copy;
    }

    private static async Task<HttpStatusCode> StateStatusAsync(HttpClient client)
    {
        using var response = await client.GetAsync(new Uri("/api/state", UriKind.Relative));
        return response.StatusCode;
    }

    private static async Task<AccessClient> SignedInAsync(OpsLvpApp app, string userName)
    {
        var person = AccessClient.For(app);
        using var response = await person.SignInAsync(userName, AccessApp.Password);
        Assert.Equal(HttpStatusCode.Redirect, response.StatusCode);
        return person;
    }

    [Fact]
    public async Task SignOut_EndsACopiedCookie_AtOnce()
    {
        await using var app = AccessApp.Start(s_slowRevalidation);
        await app.CreateUserAsync("admin.copy", Roles.Administrator);
        using var person = await SignedInAsync(app, "admin.copy");
        using var copy = CopyOf(app, person);
        Assert.NotEqual(HttpStatusCode.Unauthorized, await StateStatusAsync(copy));

        (await person.SignOutAsync()).Dispose();

        Assert.Equal(HttpStatusCode.Unauthorized, await StateStatusAsync(copy));
        using var page = await copy.GetAsync(new Uri("/admin/users", UriKind.Relative));
        Assert.Equal(HttpStatusCode.Redirect, page.StatusCode);
    }

    [Fact]
    public async Task SignOut_KeepsACopiedCookieOffTheHub()
    {
        await using var app = AccessApp.Start(s_slowRevalidation);
        await app.CreateUserAsync("v.hub", Roles.Viewer);
        using var person = await SignedInAsync(app, "v.hub");
        var cookie = person.Cookies.GetAllCookies().Single(c => c.Name == AccessSchemes.SessionCookieName);
        var copied = new CookieContainer();
        copied.Add(new Cookie(cookie.Name, cookie.Value, "/", app.BaseAddress.Host));

        (await person.SignOutAsync()).Dispose();

        await using var hub = new HubConnectionBuilder()
            .WithUrl(new Uri(app.BaseAddress, Web.Live.LiveApi.HubPath), o => o.Cookies = copied)
            .Build();
        var refused = await Assert.ThrowsAsync<HttpRequestException>(() => hub.StartAsync());
        Assert.Equal(HttpStatusCode.Unauthorized, refused.StatusCode);
    }

    [Fact]
    public async Task PasswordChange_EndsACopiedCookie_AtOnce()
    {
        await using var app = AccessApp.Start(s_slowRevalidation);
        await app.CreateUserAsync("dm.copy", Roles.DutyManager);
        using var person = await SignedInAsync(app, "dm.copy");
        using var copy = CopyOf(app, person);
        Assert.NotEqual(HttpStatusCode.Unauthorized, await StateStatusAsync(copy));

        using (var scope = app.Services.CreateScope())
        {
            var users = scope.ServiceProvider.GetRequiredService<UserManager<OpsLvpUser>>();
            var user = await users.FindByNameAsync("dm.copy");
            Assert.True((await users.ChangePasswordAsync(user!, AccessApp.Password, "a-new-password-0002")).Succeeded);
        }

        Assert.Equal(HttpStatusCode.Unauthorized, await StateStatusAsync(copy));
    }

    [Fact]
    public async Task RoleChange_EndsACopiedCookie_AtOnce()
    {
        await using var app = AccessApp.Start(s_slowRevalidation);
        var id = await app.CreateUserAsync("dm.role", Roles.DutyManager);
        using var person = await SignedInAsync(app, "dm.role");
        using var copy = CopyOf(app, person);
        Assert.NotEqual(HttpStatusCode.Unauthorized, await StateStatusAsync(copy));

        using (var scope = app.Services.CreateScope())
        {
            var users = scope.ServiceProvider.GetRequiredService<UserManager<OpsLvpUser>>();
            var user = await users.FindByIdAsync(id);
            Assert.True((await users.RemoveFromRoleAsync(user!, Roles.DutyManager)).Succeeded);
            Assert.True((await users.AddToRoleAsync(user!, Roles.Viewer)).Succeeded);
        }

        Assert.Equal(HttpStatusCode.Unauthorized, await StateStatusAsync(copy));
    }

    [Fact]
    public async Task IdleTimeout_FromConfiguration_EndsAQuietSession()
    {
        await using var app = AccessApp.Start(new Dictionary<string, string?> { ["Access:SessionIdleTimeout"] = "00:00:02" });
        await app.CreateUserAsync("v.idle", Roles.Viewer);
        using var person = await SignedInAsync(app, "v.idle");
        Assert.NotEqual(HttpStatusCode.Unauthorized, await StateStatusAsync(person.Http));

        await Task.Delay(TimeSpan.FromSeconds(3)); // past the 2 s idle timeout set above

        Assert.Equal(HttpStatusCode.Unauthorized, await StateStatusAsync(person.Http));
    }

    [Fact]
    public async Task AbsoluteLifetime_FromConfiguration_EndsEvenABusySession()
    {
        await using var app = AccessApp.Start(new Dictionary<string, string?>
        {
            ["Access:SessionLifetime"] = "00:00:03",
            ["Access:SessionIdleTimeout"] = "00:00:03",
        });
        await app.CreateUserAsync("v.busy", Roles.Viewer);
        using var person = await SignedInAsync(app, "v.busy");

        // A request every half second keeps the session from going idle (sliding renewal re-issues the cookie).
        var until = DateTime.UtcNow.AddSeconds(4);
        var last = HttpStatusCode.OK;
        while (DateTime.UtcNow < until && last != HttpStatusCode.Unauthorized)
        {
            last = await StateStatusAsync(person.Http);
            await Task.Delay(TimeSpan.FromMilliseconds(500));
        }
        await Task.Delay(TimeSpan.FromSeconds(0.5));

        Assert.Equal(HttpStatusCode.Unauthorized, await StateStatusAsync(person.Http));
    }
}
