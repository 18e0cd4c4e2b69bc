using Microsoft.AspNetCore.Components.Authorization;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Tests.Access;

/// <summary>
/// A live circuit's authentication state (the provider the app registers for circuits) is revalidated every
/// Access:RevalidationInterval (2 s here): a removed role, a disabled user or a revoked display link ends it.
/// </summary>
public sealed class LiveRevocationTests
{
    private static readonly TimeSpan Within = TimeSpan.FromSeconds(10);

    [Fact]
    public async Task GroundStaffCircuit_LosesTheRightToTick_AfterItsRoleIsRemoved()
    {
        await using var app = AccessApp.Start();
        var id = await app.CreateUserAsync("k.test", Roles.GroundStaff, "airside-ops");
        using var scope = app.Services.CreateScope();
        var provider = (AccessRevalidatingAuthenticationStateProvider)scope.ServiceProvider.GetRequiredService<AuthenticationStateProvider>();
        provider.SetAuthenticationState(Task.FromResult(new AuthenticationState(await app.PrincipalOfAsync("k.test"))));
        Assert.True(AccessApp.CanTick((await provider.GetAuthenticationStateAsync()).User));
        Assert.Contains("airside-ops", CommandCaller.FromPrincipal((await provider.GetAuthenticationStateAsync()).User).Teams);

        var result = await app.WithAdminAsync(a => a.SetRolesAsync("test-admin", id, [Roles.Viewer], []));
        Assert.True(result.Succeeded);

        var started = DateTime.UtcNow;
        await WaitUntilAsync(async () => !AccessApp.CanTick((await provider.GetAuthenticationStateAsync()).User), "the circuit to lose ground_staff");
        Assert.True(DateTime.UtcNow - started < TimeSpan.FromSeconds(60));
        Assert.False(CommandCaller.FromPrincipal((await provider.GetAuthenticationStateAsync()).User).Authenticated);
    }

    [Fact]
    public async Task Circuit_OfADisabledUser_BecomesAnonymous()
    {
        await using var app = AccessApp.Start();
        var id = await app.CreateUserAsync("r.test", Roles.DutyManager);
        using var scope = app.Services.CreateScope();
        var provider = (AccessRevalidatingAuthenticationStateProvider)scope.ServiceProvider.GetRequiredService<AuthenticationStateProvider>();
        provider.SetAuthenticationState(Task.FromResult(new AuthenticationState(await app.PrincipalOfAsync("r.test"))));

        await app.WithAdminAsync(a => a.SetDisabledAsync("test-admin", id, true));

        await WaitUntilAsync(async () => (await provider.GetAuthenticationStateAsync()).User.Identity?.IsAuthenticated != true, "the circuit to become anonymous");
    }

    [Fact]
    public async Task UnchangedUser_KeepsTheCircuit_AcrossSeveralRevalidations()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("k.test", Roles.GroundStaff, "airside-ops");
        using var scope = app.Services.CreateScope();
        var provider = (AccessRevalidatingAuthenticationStateProvider)scope.ServiceProvider.GetRequiredService<AuthenticationStateProvider>();
        provider.SetAuthenticationState(Task.FromResult(new AuthenticationState(await app.PrincipalOfAsync("k.test"))));

        await Task.Delay(TimeSpan.FromSeconds(5));

        Assert.True(AccessApp.CanTick((await provider.GetAuthenticationStateAsync()).User));
    }

    [Fact]
    public async Task RevokedDisplayLink_EndsTheWallCircuit_AndTheCookieNoLongerWorks()
    {
        await using var app = AccessApp.Start();
        var admin = app.Services.GetRequiredService<CredentialAdmin>();
        var issued = await admin.IssueDisplayAsync("test-admin", "ops room left (invented)");
        using var kiosk = AccessClient.For(app);
        using var opened = await kiosk.GetAsync("/display/" + issued.Secret);
        Assert.Equal("/wall", new Uri(app.BaseAddress, opened.Headers.Location!).AbsolutePath);
        Assert.True(kiosk.HasCookie(AccessSchemes.DisplayCookieName));
        var validator = app.Services.GetRequiredService<AccessValidator>();
        var display = new System.Security.Claims.ClaimsPrincipal(new System.Security.Claims.ClaimsIdentity(
            [new(AccessClaims.DisplayToken, issued.Credential.Id.ToString(System.Globalization.CultureInfo.InvariantCulture))], AccessSchemes.Display));
        using var scope = app.Services.CreateScope();
        var provider = (AccessRevalidatingAuthenticationStateProvider)scope.ServiceProvider.GetRequiredService<AuthenticationStateProvider>();
        provider.SetAuthenticationState(Task.FromResult(new AuthenticationState(display)));
        Assert.True(await validator.IsStillValidAsync(display));

        await admin.RevokeDisplayAsync("test-admin", issued.Credential.Id);

        Assert.False(await validator.IsStillValidAsync(display));
        await WaitUntilAsync(async () => (await provider.GetAuthenticationStateAsync()).User.Identity?.IsAuthenticated != true, "the wall circuit to become anonymous");
        using var reopened = await kiosk.GetAsync("/display/" + issued.Secret);
        Assert.Equal(System.Net.HttpStatusCode.NotFound, reopened.StatusCode);
        Assert.Contains(await app.AuditAsync(), e => e.Kind == AccessAuditKinds.DisplayTokenRevoked && e.Actor == "test-admin");
        Assert.DoesNotContain(issued.Secret, await app.DatabaseTextAsync(), StringComparison.Ordinal);
        Assert.Contains(SecretHash.Hash(issued.Secret), await app.DatabaseTextAsync(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task AfterTheServerStops_ASessionIsNoLongerValid_WithoutAnError()
    {
        var app = AccessApp.Start();
        var issued = await app.Services.GetRequiredService<CredentialAdmin>().IssueDisplayAsync("test-admin", "ops room right (invented)");
        var validator = app.Services.GetRequiredService<AccessValidator>();
        var display = new System.Security.Claims.ClaimsPrincipal(new System.Security.Claims.ClaimsIdentity(
            [new(AccessClaims.DisplayToken, issued.Credential.Id.ToString(System.Globalization.CultureInfo.InvariantCulture))], AccessSchemes.Display));
        Assert.True(await validator.IsStillValidAsync(display));

        // Circuits left open at shutdown still run their revalidation loop against disposed services.
        await app.DisposeAsync();

        Assert.False(await validator.IsStillValidAsync(display));
    }

    private static async Task WaitUntilAsync(Func<Task<bool>> condition, string what)
    {
        var deadline = DateTime.UtcNow + Within;
        while (!await condition())
        {
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"timed out after {Within.TotalSeconds} s waiting for {what}");
            }
            await Task.Delay(100);
        }
    }
}
