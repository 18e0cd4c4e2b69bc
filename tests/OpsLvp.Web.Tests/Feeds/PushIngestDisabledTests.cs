using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Feeds;

public sealed class PushIngestDisabledTests
{
    [Fact]
    public async Task NoKeysConfigured_EveryPushIs401_SayingWhichSettingEnablesIt()
    {
        await using var app = OpsLvpApp.Start();
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("""{ "readings": [] }""", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, "any-key-0123456789abcdef");

        using var response = await app.Client.SendAsync(request);

        Assert.Equal(HttpStatusCode.Unauthorized, response.StatusCode);
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal("push ingest is disabled: no keys are configured in Feeds:Push:ApiKeys or issued on /admin/keys", body.GetProperty("error").GetString());
        Assert.Equal("ApiKey header=\"X-Api-Key\"", response.Headers.WwwAuthenticate.ToString());
    }
}
