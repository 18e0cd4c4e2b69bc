using System.Globalization;
using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>
/// POST /api/readings with the engine running on the demo profile (seed-demo/profile.json, invented aerodrome XDMO):
/// the 202 answer gives each item's outcome, including what the engine's screen refuses. Values are invented.
/// </summary>
public sealed class PushScreeningTests : IAsyncLifetime
{
    private const string Key = "screen-key-0123456789abcdef";

    private static readonly Uri s_endpoint = new("/api/readings", UriKind.Relative);

    private OpsLvpApp _app = null!;

    public Task InitializeAsync()
    {
        _app = OpsLvpApp.Start(new Dictionary<string, string?>
        {
            ["Feeds:Push:ApiKeys:0:Name"] = "station-s",
            ["Feeds:Push:ApiKeys:0:Key"] = Key,
            ["Feeds:Push:MaxReadings"] = "6",
        });
        return Task.CompletedTask;
    }

    public async Task DisposeAsync() => await _app.DisposeAsync();

    private string Now(TimeSpan offset) =>
        (_app.Services.GetRequiredService<TimeProvider>().GetUtcNow() + offset).ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    private async Task<(HttpStatusCode Status, JsonElement Body)> PostAsync(byte[] body)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, s_endpoint) { Content = new ByteArrayContent(body) };
        request.Content.Headers.ContentType = new System.Net.Http.Headers.MediaTypeHeaderValue("application/json");
        request.Headers.Add(ReadingsApi.ApiKeyHeader, Key);
        using var response = await _app.Client.SendAsync(request);
        return (response.StatusCode, await response.Content.ReadFromJsonAsync<JsonElement>());
    }

    private Task<(HttpStatusCode Status, JsonElement Body)> PostAsync(string body) => PostAsync(Encoding.UTF8.GetBytes(body));

    private static string Item(string time, string sensor, string kind, string value, string status = "ok") =>
        $$"""{ "time": "{{time}}", "sensor": "{{sensor}}", "kind": "{{kind}}", "value": {{value}}, "status": "{{status}}" }""";

    [Fact]
    public async Task EachItem_IsAnsweredAcceptedOrRejected_WithTheEnginesScreeningReasons()
    {
        var t = Now(TimeSpan.FromSeconds(-1));
        var body = "{ \"readings\": [" + string.Join(",",
            Item(t, "vis-main", "visibility", "1200"),
            Item(t, "no-such-sensor", "visibility", "1200"),
            Item(t, "vis-main", "rvr", "1200"),
            Item(t, "ceilo-west", "cloud_base", "900000"),
            Item(Now(TimeSpan.FromHours(1)), "lum-main", "background_luminance", "50"),
            Item(t, "ceilo-east", "cloud_base", "300", status: "failed")) + "] }";

        var (status, answer) = await PostAsync(body);

        Assert.Equal(HttpStatusCode.Accepted, status);
        Assert.Equal(1, answer.GetProperty("accepted").GetInt32());
        var items = answer.GetProperty("items").EnumerateArray().ToList();
        Assert.Equal([0, 1, 2, 3, 4, 5], items.Select(i => i.GetProperty("index").GetInt32()));
        Assert.Equal(
            ["accepted", "rejected", "rejected", "rejected", "rejected", "rejected"],
            items.Select(i => i.GetProperty("outcome").GetString()));
        // Reason codes are the stable wire names of Core's RejectReason (docs/feeds.md).
        Assert.Equal(
            ["unknown_sensor", "kind_not_produced", "out_of_range", "future_dated", "status_not_ok"],
            items.Skip(1).Select(i => i.GetProperty("reason").GetString()));
        Assert.Equal("sensor 'no-such-sensor' is not in the profile", items[1].GetProperty("detail").GetString());
        Assert.Equal("a Visibility sensor does not produce Rvr", items[2].GetProperty("detail").GetString());
        Assert.Equal("900000 outside 0..50000 for CloudBase", items[3].GetProperty("detail").GetString());
        Assert.Equal(5, answer.GetProperty("rejected").GetArrayLength());
    }

    [Fact]
    public async Task DuplicateValueKey_IsRefused_NotTakenAsTheLastValue()
    {
        // The attack in the issue: a low second "value" would have moved the phase.
        var t = Now(TimeSpan.FromSeconds(-1));
        var (status, answer) = await PostAsync($$"""{ "readings": [ { "time": "{{t}}", "sensor": "rvr-07l-tdz", "kind": "rvr", "value": 1800, "value": 100, "status": "ok" } ] }""");

        Assert.Equal(HttpStatusCode.Accepted, status);
        Assert.Equal(0, answer.GetProperty("accepted").GetInt32());
        var item = Assert.Single(answer.GetProperty("items").EnumerateArray().ToList());
        Assert.Equal("malformed", item.GetProperty("reason").GetString());
        Assert.Equal("field \"value\" is given more than once", item.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task InvalidUtf8_Is400WithAReason_Not500()
    {
        var bytes = Encoding.UTF8.GetBytes(Item(Now(TimeSpan.Zero), "vis-mainX", "visibility", "1200"));
        var at = Array.IndexOf(bytes, (byte)'X');
        bytes[at] = 0xC3; // a two-byte lead before '"': not UTF-8
        var body = Encoding.UTF8.GetBytes("{ \"readings\": [").Concat(bytes).Concat(Encoding.UTF8.GetBytes("] }")).ToArray();

        var (status, answer) = await PostAsync(body);

        Assert.Equal(HttpStatusCode.BadRequest, status);
        Assert.StartsWith("body is not valid UTF-8", answer.GetProperty("error").GetString(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task MoreReadingsThanConfigured_Is413NamingTheSetting()
    {
        var t = Now(TimeSpan.FromSeconds(-1));
        var body = "{ \"readings\": [" + string.Join(",", Enumerable.Repeat(Item(t, "vis-main", "visibility", "1200"), 7)) + "] }";

        var (status, answer) = await PostAsync(body);

        Assert.Equal(HttpStatusCode.RequestEntityTooLarge, status);
        Assert.Equal("\"readings\" has 7 items; at most 6 are accepted per document (Feeds:Push:MaxReadings)", answer.GetProperty("error").GetString());
    }

    [Fact]
    public async Task ControlCharacterInSensorId_IsRejectedAndNotEchoedRaw()
    {
        var t = Now(TimeSpan.FromSeconds(-1));
        var (status, answer) = await PostAsync($$"""{ "readings": [ { "time": "{{t}}", "sensor": "vis-main\r\n", "kind": "visibility", "value": 1200, "status": "ok" } ] }""");

        Assert.Equal(HttpStatusCode.Accepted, status);
        var item = Assert.Single(answer.GetProperty("items").EnumerateArray().ToList());
        Assert.Equal("rejected", item.GetProperty("outcome").GetString());
        var detail = item.GetProperty("detail").GetString()!;
        Assert.StartsWith("sensor contains a control character (U+000D at position 8)", detail, StringComparison.Ordinal);
        Assert.DoesNotContain(detail, char.IsControl);
    }
}
