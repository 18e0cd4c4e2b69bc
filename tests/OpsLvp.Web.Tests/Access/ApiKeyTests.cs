using System.Net;
using System.Text;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;
using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Tests.Access;

/// <summary>API keys from the store on POST /api/readings: scope, revocation, last use, hashing.</summary>
public sealed class ApiKeyTests
{
    private const string Batch = """{"readings":[{"time":"2026-01-15T02:00:00Z","sensor":"T1","kind":"rvr","value":900,"status":"ok"}]}""";

    [Fact]
    public async Task IngestKey_IsAccepted_RecordsLastUse_AndIsStoredOnlyAsAHash()
    {
        await using var app = AccessApp.Start();
        var issued = await app.Services.GetRequiredService<CredentialAdmin>().IssueKeyAsync("test-admin", "north sensors (invented)", [ApiKeyStore.IngestScope]);

        using var response = await PostAsync(app, issued.Secret);

        Assert.Equal(HttpStatusCode.Accepted, response.StatusCode);
        Assert.Contains("push:north sensors (invented)", await response.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        var listed = (await app.Services.GetRequiredService<ApiKeyStore>().ListAsync()).Single();
        Assert.NotNull(listed.LastUsedAt);
        var stored = await app.DatabaseTextAsync();
        Assert.DoesNotContain(issued.Secret, stored, StringComparison.Ordinal);
        Assert.Contains(SecretHash.Hash(issued.Secret), stored, StringComparison.Ordinal);
        Assert.Contains(await app.AuditAsync(), e => e.Kind == AccessAuditKinds.ApiKeyIssued && e.Actor == "test-admin");
    }

    [Fact]
    public async Task RevokedKey_Is401()
    {
        await using var app = AccessApp.Start();
        var admin = app.Services.GetRequiredService<CredentialAdmin>();
        var issued = await admin.IssueKeyAsync("test-admin", "north sensors (invented)", [ApiKeyStore.IngestScope]);
        using var before = await PostAsync(app, issued.Secret);
        Assert.Equal(HttpStatusCode.Accepted, before.StatusCode);

        await admin.RevokeKeyAsync("test-admin", issued.Credential.Id);
        using var after = await PostAsync(app, issued.Secret);

        Assert.Equal(HttpStatusCode.Unauthorized, after.StatusCode);
    }

    [Fact]
    public async Task HubReadKey_CannotIngest()
    {
        await using var app = AccessApp.Start();
        var issued = await app.Services.GetRequiredService<CredentialAdmin>().IssueKeyAsync("test-admin", "wall relay (invented)", [ApiKeyStore.HubReadScope]);

        using var response = await PostAsync(app, issued.Secret);

        Assert.Equal(HttpStatusCode.Forbidden, response.StatusCode);
        Assert.Contains("does not have the ingest scope", await response.Content.ReadAsStringAsync(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task SignedInUser_WithoutAKey_CannotIngest()
    {
        await using var app = AccessApp.Start();
        await app.Services.GetRequiredService<CredentialAdmin>().IssueKeyAsync("test-admin", "north sensors (invented)", [ApiKeyStore.IngestScope]);
        await app.CreateUserAsync("admin.test", Web.Commands.Roles.Administrator);
        using var client = AccessClient.For(app);
        using var signIn = await client.SignInAsync("admin.test", AccessApp.Password);

        using var content = new StringContent(Batch, Encoding.UTF8, "application/json");
        using var response = await client.Http.PostAsync(new Uri("/api/readings", UriKind.Relative), content);

        Assert.Equal(HttpStatusCode.Unauthorized, response.StatusCode);
    }

    [Fact]
    public void UnknownScope_IsRefused_NamingIt()
    {
        var error = Assert.Throws<ArgumentException>(() => SecretHashCheck());
        Assert.Contains("write-all", error.Message, StringComparison.Ordinal);

        static void SecretHashCheck() =>
            new ApiKeyStore(null!).IssueAsync("x", ["write-all"], "a", DateTimeOffset.UnixEpoch).GetAwaiter().GetResult();
    }

    private static async Task<HttpResponseMessage> PostAsync(Infrastructure.OpsLvpApp app, string key)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent(Batch, Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, key);
        return await app.Client.SendAsync(request);
    }
}
