using System.Net;
using System.Text;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Access;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>
/// The one ingest-key check (<see cref="IngestKeyCheck"/>) on <c>/api/forecasts</c> and <c>/api/facilities</c>, over a real
/// Kestrel server: no keys at all, a missing header, a key that matches nothing and a key without the ingest scope are
/// each refused with the status and reason docs/access.md gives. Key names are invented.
/// </summary>
public sealed class IngestKeyCheckTests
{
    [Theory]
    [InlineData("/api/forecasts", """{ "forecasts": [] }""", "push ingest")]
    [InlineData("/api/facilities", """{ "facilities": [] }""", "facility ingest")]
    public async Task EachRefusal_HasItsStatusAndReason(string path, string body, string what)
    {
        await using var app = AccessApp.Start();

        using var disabled = await PostAsync(app, path, body, key: null);
        Assert.Equal(HttpStatusCode.Unauthorized, disabled.StatusCode);
        Assert.Contains($"{what} is disabled: no keys are configured", await disabled.Content.ReadAsStringAsync(), StringComparison.Ordinal);

        // once an ingest key exists, ingest is enabled and each bad key is refused for its own reason
        var admin = app.Services.GetRequiredService<CredentialAdmin>();
        var ingest = await admin.IssueKeyAsync("test-admin", "north feed (invented)", [ApiKeyStore.IngestScope]);
        var reader = await admin.IssueKeyAsync("test-admin", "wall relay (invented)", [ApiKeyStore.HubReadScope]);

        using var missing = await PostAsync(app, path, body, key: null);
        Assert.Equal(HttpStatusCode.Unauthorized, missing.StatusCode);
        Assert.Contains("missing X-Api-Key header", await missing.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        Assert.Contains("X-Api-Key", missing.Headers.WwwAuthenticate.ToString(), StringComparison.Ordinal);

        using var wrong = await PostAsync(app, path, body, key: "not-a-key-0000000000");
        Assert.Equal(HttpStatusCode.Unauthorized, wrong.StatusCode);
        Assert.Contains("does not match any configured key", await wrong.Content.ReadAsStringAsync(), StringComparison.Ordinal);

        using var unscoped = await PostAsync(app, path, body, reader.Secret);
        Assert.Equal(HttpStatusCode.Forbidden, unscoped.StatusCode);
        Assert.Contains("does not have the ingest scope", await unscoped.Content.ReadAsStringAsync(), StringComparison.Ordinal);

        using var allowed = await PostAsync(app, path, body, ingest.Secret);
        Assert.NotEqual(HttpStatusCode.Unauthorized, allowed.StatusCode);
        Assert.NotEqual(HttpStatusCode.Forbidden, allowed.StatusCode);
    }

    private static async Task<HttpResponseMessage> PostAsync(Infrastructure.OpsLvpApp app, string path, string body, string? key)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri(path, UriKind.Relative))
        {
            Content = new StringContent(body, Encoding.UTF8, "application/json"),
        };
        if (key is not null)
        {
            request.Headers.Add(ReadingsApi.ApiKeyHeader, key);
        }
        return await app.Client.SendAsync(request);
    }
}
