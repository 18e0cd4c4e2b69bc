using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>POST /api/readings over real Kestrel. Sensor ids and values are invented.</summary>
public sealed class PushIngestTests(PushAppFixture fixture) : IClassFixture<PushAppFixture>
{
    private static readonly Uri s_endpoint = new("/api/readings", UriKind.Relative);

    private OpsLvpApp App => fixture.App;

    private Task<HttpResponseMessage> PostAsync(string body, string? key = PushAppFixture.Key)
    {
        var request = new HttpRequestMessage(HttpMethod.Post, s_endpoint)
        {
            Content = new StringContent(body, Encoding.UTF8, "application/json"),
        };
        if (key is not null)
        {
            request.Headers.Add(ReadingsApi.ApiKeyHeader, key);
        }

        return App.Client.SendAsync(request);
    }

    [Fact]
    public async Task GoodBatch_Returns202_AndReachesPipelineWithPushSource()
    {
        using var response = await PostAsync("""
            { "readings": [ { "time": "2026-01-15T04:00:00Z", "sensor": "PUSHGOOD1", "kind": "visibility", "value": 800, "status": "ok" } ] }
            """);

        Assert.Equal(HttpStatusCode.Accepted, response.StatusCode);
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal(1, body.GetProperty("accepted").GetInt32());
        Assert.Equal(0, body.GetProperty("rejected").GetArrayLength());
        var batch = await App.NextBatchAsync(b => b.Readings.Any(r => r.SensorId == "PUSHGOOD1"));
        Assert.Equal("push:station-a", batch.Source);
        Assert.Equal(new Reading(new DateTimeOffset(2026, 1, 15, 4, 0, 0, TimeSpan.Zero), "PUSHGOOD1", ReadingKind.Visibility, 800), batch.Readings[0]);
        var feed = await App.GetFeedHealthAsync("push:station-a");
        Assert.NotEqual(JsonValueKind.Null, feed.GetProperty("lastGoodAt").ValueKind);
    }

    [Fact]
    public async Task MalformedItems_AreReportedWithReasons_AndGoodItemsStillPass()
    {
        using var response = await PostAsync("""
            { "readings": [
                { "time": "2026-01-15T04:01:00Z", "sensor": "PUSHMIX1", "kind": "rvr", "value": 300, "status": "ok" },
                { "time": "2026-01-15T04:01:00Z", "sensor": "PUSHMIX2", "kind": "rvr", "value": "300", "status": "ok" },
                { "time": "2026-01-15T04:01:00Z", "sensor": "PUSHMIX3", "kind": "rvr", "value": 300, "status": "fine" },
                42
            ] }
            """);

        Assert.Equal(HttpStatusCode.Accepted, response.StatusCode);
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal(1, body.GetProperty("accepted").GetInt32());
        var rejected = body.GetProperty("rejected").EnumerateArray().ToList();
        Assert.Equal([1, 2, 3], rejected.Select(r => r.GetProperty("index").GetInt32()));
        Assert.All(rejected, r => Assert.Equal("malformed", r.GetProperty("reason").GetString()));
        Assert.Equal("value must be a number (got a string)", rejected[0].GetProperty("detail").GetString());
        Assert.Equal("PUSHMIX2", rejected[0].GetProperty("sensor").GetString());
        Assert.StartsWith("status 'fine' is not one of ok, degraded, failed, maintenance", rejected[1].GetProperty("detail").GetString(), StringComparison.Ordinal);
        Assert.Equal("item must be an object (got a number)", rejected[2].GetProperty("detail").GetString());

        var batch = await App.NextBatchAsync(b => b.Readings.Any(r => r.SensorId == "PUSHMIX1"));
        Assert.Equal(3, batch.Rejections.Count);
    }

    [Fact]
    public async Task MissingKey_Returns401_NamingTheHeader()
    {
        using var response = await PostAsync("""{ "readings": [] }""", key: null);

        Assert.Equal(HttpStatusCode.Unauthorized, response.StatusCode);
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal("missing X-Api-Key header", body.GetProperty("error").GetString());
    }

    [Fact]
    public async Task WrongKey_Returns401_AndNothingReachesPipeline()
    {
        using var response = await PostAsync("""
            { "readings": [ { "time": "2026-01-15T04:02:00Z", "sensor": "PUSHWRONGKEY", "kind": "rvr", "value": 300, "status": "ok" } ] }
            """, key: "not-the-key-0123456789");

        Assert.Equal(HttpStatusCode.Unauthorized, response.StatusCode);
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal("the X-Api-Key header does not match any configured key", body.GetProperty("error").GetString());
        await Assert.ThrowsAsync<Xunit.Sdk.XunitException>(() =>
            App.NextBatchAsync(b => b.Readings.Any(r => r.SensorId == "PUSHWRONGKEY"), TimeSpan.FromMilliseconds(300)));
    }

    [Fact]
    public async Task OversizedBody_Returns413_AndServerStaysHealthy()
    {
        var item = """{ "time": "2026-01-15T04:03:00Z", "sensor": "PUSHBIG", "kind": "rvr", "value": 300, "status": "ok" }""";
        var body = "{ \"readings\": [" + string.Join(",", Enumerable.Repeat(item, 100)) + "] }";
        Assert.True(Encoding.UTF8.GetByteCount(body) > PushAppFixture.MaxBodyBytes);

        using var response = await PostAsync(body);

        Assert.Equal(HttpStatusCode.RequestEntityTooLarge, response.StatusCode);
        var error = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal("request body exceeds Feeds:Push:MaxBodyBytes (4096 bytes)", error.GetProperty("error").GetString());
        await App.GetHealthAsync();
    }

    [Fact]
    public async Task OversizedChunkedBody_WithoutContentLength_Returns413()
    {
        var payload = new string(' ', PushAppFixture.MaxBodyBytes * 2);
        var request = new HttpRequestMessage(HttpMethod.Post, s_endpoint)
        {
            Content = new StreamContent(new MemoryStream(Encoding.UTF8.GetBytes(payload))),
        };
        request.Headers.TransferEncodingChunked = true;
        request.Headers.Add(ReadingsApi.ApiKeyHeader, PushAppFixture.Key);

        using var response = await App.Client.SendAsync(request);

        Assert.Equal(HttpStatusCode.RequestEntityTooLarge, response.StatusCode);
    }

    [Fact]
    public async Task GarbageBody_Returns400_WithReason_AndHealthRecordsIt()
    {
        using var response = await PostAsync("<readings>not json</readings>");

        Assert.Equal(HttpStatusCode.BadRequest, response.StatusCode);
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.StartsWith("body is not valid JSON", body.GetProperty("error").GetString(), StringComparison.Ordinal);
        var feed = await App.GetFeedHealthAsync("push:station-a");
        Assert.StartsWith("bad document: body is not valid JSON", feed.GetProperty("lastError").GetString(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task WrongShape_Returns400_SayingWhatIsExpected()
    {
        using var response = await PostAsync("""[ { "sensor": "X" } ]""");

        Assert.Equal(HttpStatusCode.BadRequest, response.StatusCode);
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal("body must be a JSON object with a \"readings\" array (got an array)", body.GetProperty("error").GetString());
    }
}
