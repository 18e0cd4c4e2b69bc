using System.Globalization;
using System.Net;
using System.Text;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Access;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>A push feed alternating good and broken deliveries, with the engine running: the audit is not flooded.</summary>
public sealed class PushFlappingTests
{
    private const string Key = "flap-key-0123456789abcdef";

    [Fact]
    public async Task AFlappingFeed_GetsOneAuditEntryPerInterval_NotOnePerChange()
    {
        await using var app = OpsLvpApp.Start(new Dictionary<string, string?>
        {
            ["Feeds:Push:ApiKeys:0:Name"] = "station-f",
            ["Feeds:Push:ApiKeys:0:Key"] = Key,
            ["Feeds:HealthAuditInterval"] = "01:00:00",
        });
        var clock = app.Services.GetRequiredService<TimeProvider>();

        for (var i = 0; i < 15; i++)
        {
            var time = clock.GetUtcNow().ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", CultureInfo.InvariantCulture);
            foreach (var body in new[] { $$"""{ "readings": [ { "time": "{{time}}", "sensor": "vis-main", "kind": "visibility", "value": 1500, "status": "ok" } ] }""", "not json" })
            {
                using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
                {
                    Content = new StringContent(body, Encoding.UTF8, "application/json"),
                };
                request.Headers.Add(ReadingsApi.ApiKeyHeader, Key);
                using var response = await app.Client.SendAsync(request);
                Assert.True(response.StatusCode is HttpStatusCode.Accepted or HttpStatusCode.BadRequest);
                // Room for the engine host to evaluate (tick 0.5 s) and see each status.
                await Task.Delay(600);
            }
        }

        var entries = (await app.AuditAsync())
            .Where(e => e.Kind.StartsWith("feed_", StringComparison.Ordinal) && e.PayloadJson.Contains("push:station-f", StringComparison.Ordinal))
            .ToList();
        Assert.Single(entries);
    }
}
