using System.Net;
using System.Reflection;
using Microsoft.AspNetCore.SignalR.Client;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Access;

/// <summary>The hub /hubs/lvp with a real SignalR client: who may connect, and revocation closing the connection.</summary>
public sealed class HubAccessTests
{
    [Fact]
    public void EveryClientCallableHubMethod_HasAPolicy()
    {
        var methods = typeof(LvpHub).GetMethods(BindingFlags.Public | BindingFlags.Instance | BindingFlags.DeclaredOnly)
            .Where(m => !m.IsSpecialName && m.GetBaseDefinition().DeclaringType == typeof(LvpHub))
            .Select(m => m.Name);

        Assert.All(methods, m => Assert.True(HubMethodPolicies.Table.ContainsKey(m), $"hub method {m} has no policy in HubMethodPolicies"));
    }

    [Fact]
    public async Task Anonymous_CannotConnect()
    {
        await using var app = AccessApp.Start();
        await using var connection = Connect(app, null, null);

        var error = await Assert.ThrowsAsync<HttpRequestException>(() => connection.StartAsync());
        Assert.Equal(HttpStatusCode.Unauthorized, error.StatusCode);
    }

    [Theory]
    [InlineData(Roles.Viewer)]
    [InlineData(Roles.GroundStaff)]
    [InlineData(Roles.DutyManager)]
    [InlineData(Roles.Administrator)]
    public async Task AnyRole_CanConnect(string role)
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("someone", role, role == Roles.GroundStaff ? ["airside-ops"] : []);
        using var client = AccessClient.For(app);
        using var _ = await client.SignInAsync("someone", AccessApp.Password);
        await using var connection = Connect(app, client.Cookies, null);

        await connection.StartAsync();

        Assert.Equal(HubConnectionState.Connected, connection.State);
    }

    [Fact]
    public async Task IngestOnlyKey_CannotConnect_HubReadKeyCan_AndIsDroppedWhenRevoked()
    {
        await using var app = AccessApp.Start();
        var admin = app.Services.GetRequiredService<CredentialAdmin>();
        var ingest = await admin.IssueKeyAsync("test-admin", "sensors (invented)", [ApiKeyStore.IngestScope]);
        var reader = await admin.IssueKeyAsync("test-admin", "relay (invented)", [ApiKeyStore.HubReadScope]);

        await using (var refused = Connect(app, null, ingest.Secret))
        {
            var error = await Assert.ThrowsAsync<HttpRequestException>(() => refused.StartAsync());
            Assert.Equal(HttpStatusCode.Forbidden, error.StatusCode);
        }

        await using var connection = Connect(app, null, reader.Secret);
        var closed = new TaskCompletionSource();
        connection.Closed += _ => { closed.TrySetResult(); return Task.CompletedTask; };
        await connection.StartAsync();
        Assert.Equal(HubConnectionState.Connected, connection.State);

        await admin.RevokeKeyAsync("test-admin", reader.Credential.Id);

        await closed.Task.WaitAsync(TimeSpan.FromSeconds(10));
    }

    [Fact]
    public async Task DisplayLink_CanConnect_AndRevocationDisconnectsTheScreen()
    {
        await using var app = AccessApp.Start();
        var admin = app.Services.GetRequiredService<CredentialAdmin>();
        var issued = await admin.IssueDisplayAsync("test-admin", "ops room right (invented)");
        using var kiosk = AccessClient.For(app);
        using var opened = await kiosk.GetAsync("/display/" + issued.Secret);
        Assert.Equal(HttpStatusCode.Redirect, opened.StatusCode);
        await using var connection = Connect(app, kiosk.Cookies, null);
        var closed = new TaskCompletionSource();
        connection.Closed += _ => { closed.TrySetResult(); return Task.CompletedTask; };
        await connection.StartAsync();

        await admin.RevokeDisplayAsync("test-admin", issued.Credential.Id);

        await closed.Task.WaitAsync(TimeSpan.FromSeconds(10));
        await using var again = Connect(app, kiosk.Cookies, null);
        await Assert.ThrowsAnyAsync<Exception>(() => again.StartAsync());
    }

    [Fact]
    public async Task UserWhoseRoleIsRemoved_IsDisconnected_WithinTheRevalidationInterval()
    {
        await using var app = AccessApp.Start();
        var id = await app.CreateUserAsync("k.test", Roles.GroundStaff, "airside-ops");
        using var client = AccessClient.For(app);
        using var _ = await client.SignInAsync("k.test", AccessApp.Password);
        await using var connection = Connect(app, client.Cookies, null);
        var closed = new TaskCompletionSource();
        connection.Closed += _ => { closed.TrySetResult(); return Task.CompletedTask; };
        await connection.StartAsync();

        await app.WithAdminAsync(a => a.SetRolesAsync("test-admin", id, [Roles.Viewer], []));

        await closed.Task.WaitAsync(TimeSpan.FromSeconds(10)); // interval 2 s in AccessApp; the product bound is 60 s
    }

    private static HubConnection Connect(OpsLvpApp app, CookieContainer? cookies, string? apiKey) =>
        new HubConnectionBuilder()
            .WithUrl(new Uri(app.BaseAddress, LiveApi.HubPath), o =>
            {
                if (cookies is not null)
                {
                    o.Cookies = cookies;
                }
                if (apiKey is not null)
                {
                    o.Headers[ApiKeyAuthenticationHandler.Header] = apiKey;
                }
            })
            .Build();
}
