using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using System.Threading.Channels;
using Microsoft.AspNetCore.SignalR.Client;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>
/// POST /api/facilities over real Kestrel with the engine running on the invented seed-demo profile (facility ids
/// from docs/capability.md): per-entry answers, nothing else lost, audited, and /api/state carries the capability
/// per runway direction (docs/engine.md R30, R31). Reasons and key are invented.
/// </summary>
public sealed class FacilityIngestTests : IAsyncLifetime
{
    private const string Key = "facility-test-key-0123456789";

    private static readonly Uri s_endpoint = new("/api/facilities", UriKind.Relative);

    private OpsLvpApp _app = null!;

    public Task InitializeAsync()
    {
        _app = OpsLvpApp.Start(new Dictionary<string, string?>
        {
            ["Feeds:Push:ApiKeys:0:Name"] = "lighting-system",
            ["Feeds:Push:ApiKeys:0:Key"] = Key,
            ["Engine:TickInterval"] = "00:00:00.200",
        });
        return Task.CompletedTask;
    }

    public async Task DisposeAsync() => await _app.DisposeAsync();

    private async Task<HttpResponseMessage> PostAsync(string body, string? key = Key)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, s_endpoint)
        {
            Content = new StringContent(body, Encoding.UTF8, "application/json"),
        };
        if (key is not null)
        {
            request.Headers.Add(ReadingsApi.ApiKeyHeader, key);
        }
        return await _app.Client.SendAsync(request);
    }

    /// <summary>GET /api/state until <paramref name="done"/> holds (the state is published after the audit commit), 30 s ceiling.</summary>
    private async Task<JsonElement> StateWhenAsync(Func<JsonElement, bool> done, string what)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(30);
        while (true)
        {
            using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/api/state", UriKind.Relative));
            request.Headers.Add(ReadingsApi.ApiKeyHeader, await LiveClient.ReaderKeyAsync(_app));
            using var response = await _app.Client.SendAsync(request);
            if (response.StatusCode == HttpStatusCode.OK)
            {
                var state = await response.Content.ReadFromJsonAsync<JsonElement>();
                if (done(state))
                {
                    return state;
                }
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"/api/state never showed {what} within 30 s (last answer {(int)response.StatusCode})");
            }
            await Task.Delay(100);
        }
    }

    private static JsonElement Operation(JsonElement state, string direction, string kind) =>
        state.GetProperty("status").GetProperty("capability").EnumerateArray()
            .Single(d => d.GetProperty("direction").GetString() == direction)
            .GetProperty("operations").EnumerateArray()
            .Single(o => o.GetProperty("kind").GetString() == kind);

    private static bool NamesFacility(JsonElement operation, string facility) =>
        operation.GetProperty("reasons").EnumerateArray().Any(r =>
            r.GetProperty("kind").GetString() == "facilityUnserviceable" && r.GetProperty("facility").GetString() == facility);

    [Fact]
    public async Task MixedReport_GoodEntriesApplied_EachBadEntryHasItsReason_AndStateCarriesTheCapability()
    {
        var before = await StateWhenAsync(_ => true, "a state");
        Assert.False(NamesFacility(Operation(before, "07L", "catIII"), "tdzl-07l"));

        using var response = await PostAsync("""
            { "facilities": [
                { "facility": "tdzl-07l", "status": "unserviceable", "reason": "circuit 3 tripped (invented)" },
                { "facility": "no-such-thing", "status": "unserviceable", "reason": "x" },
                { "facility": "als-07l", "status": "broken", "reason": "x" },
                { "facility": "als-07l", "status": "degraded", "reason": "   " },
                { "facility": "als-07l", "status": "degraded", "reason": "bad\u0007bell" },
                { "facility": "als-07l", "status": 3, "reason": "x" },
                42,
                { "facility": "sb-07l", "status": "degraded", "reason": "two segments dark (invented)" }
            ] }
            """);

        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal("ingest:lighting-system", body.GetProperty("source").GetString());
        Assert.Equal(2, body.GetProperty("accepted").GetInt32());
        Assert.Equal(6, body.GetProperty("rejected").GetInt32());
        var items = body.GetProperty("items").EnumerateArray().ToList();
        Assert.Equal([0, 1, 2, 3, 4, 5, 6, 7], items.Select(i => i.GetProperty("index").GetInt32()));
        Assert.Equal(
            ["accepted", "unknown_facility", "unknown_status", "missing_reason", "control_characters", "malformed", "malformed", "accepted"],
            items.Select(i => i.GetProperty("outcome").GetString() == "accepted" ? "accepted" : i.GetProperty("reason").GetString()));
        Assert.Equal("facility 'no-such-thing' is not in the profile", items[1].GetProperty("detail").GetString());
        Assert.Equal("status must be a string (got a number)", items[5].GetProperty("detail").GetString());
        Assert.Equal("entry must be an object (got a number)", items[6].GetProperty("detail").GetString());

        // the state: CAT III on 07L names the TDZ lights; the degraded stop bars are not lost either
        var after = await StateWhenAsync(s => NamesFacility(Operation(s, "07L", "catIII"), "tdzl-07l"), "CAT III 07L naming the TDZ lights");
        var facilities = after.GetProperty("status").GetProperty("facilities");
        Assert.Equal("unserviceable", facilities.GetProperty("tdzl-07l").GetProperty("status").GetString());
        Assert.Equal("degraded", facilities.GetProperty("sb-07l").GetProperty("status").GetString());
        Assert.False(facilities.TryGetProperty("als-07l", out _));

        // audited like the console's report: a manual_action of actor ingest:<key name> with the reason
        var entries = await LiveClient.EntriesAsync(_app);
        var reports = entries.Where(e => e.Kind == "manual_action" && e.Actor == "ingest:lighting-system").ToList();
        Assert.Equal(2, reports.Count);
        Assert.Contains("circuit 3 tripped (invented)", reports[0].PayloadJson, StringComparison.Ordinal);
        Assert.Contains("tdzl-07l", reports[0].PayloadJson, StringComparison.Ordinal);
        Assert.Contains("sb-07l", reports[1].PayloadJson, StringComparison.Ordinal);
        await LiveClient.AssertChainVerifiesAsync(_app);
    }

    [Fact]
    public async Task ClearingTheFault_TakesTheReasonAway()
    {
        using (var down = await PostAsync("""{ "facilities": [ { "facility": "als-07l", "status": "unserviceable", "reason": "lamp fault (invented)" } ] }"""))
        {
            Assert.Equal(HttpStatusCode.OK, down.StatusCode);
        }
        await StateWhenAsync(s => NamesFacility(Operation(s, "07L", "catI"), "als-07l"), "CAT I 07L naming the approach lights");

        using var up = await PostAsync("""{ "facilities": [ { "facility": "als-07l", "status": "serviceable", "reason": "lamp replaced (invented)" } ] }""");

        Assert.Equal(HttpStatusCode.OK, up.StatusCode);
        var cleared = await StateWhenAsync(s => !NamesFacility(Operation(s, "07L", "catI"), "als-07l"), "CAT I 07L without the approach lights");
        Assert.False(cleared.GetProperty("status").GetProperty("facilities").TryGetProperty("als-07l", out _));

        // the engine's own refusal comes back as the entry's reason (docs/engine.md R30)
        using var again = await PostAsync("""{ "facilities": [ { "facility": "als-07l", "status": "serviceable", "reason": "still fine (invented)" } ] }""");
        var item = (await again.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("items")[0];
        Assert.Equal("refused", item.GetProperty("reason").GetString());
        Assert.Equal("Approach lights 07L is already serviceable", item.GetProperty("detail").GetString());
    }

    [Fact]
    public async Task NoKey_WrongKey_NotJson_AreRefusedWholeWithAReason_AndChangeNothing()
    {
        const string report = """{ "facilities": [ { "facility": "ils-07l", "status": "unserviceable", "reason": "x (invented)" } ] }""";
        using var none = await PostAsync(report, key: null);
        using var wrong = await PostAsync(report, key: "not-a-key-0000000000");
        using var notJson = await PostAsync("{ \"facilities\": [ ");
        using var noArray = await PostAsync("""{ "items": [] }""");

        Assert.Equal(HttpStatusCode.Unauthorized, none.StatusCode);
        Assert.Contains("missing X-Api-Key header", await none.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        Assert.Equal(HttpStatusCode.Unauthorized, wrong.StatusCode);
        Assert.Equal(HttpStatusCode.BadRequest, notJson.StatusCode);
        Assert.Contains("not valid JSON", await notJson.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        Assert.Equal(HttpStatusCode.BadRequest, noArray.StatusCode);
        var state = await StateWhenAsync(_ => true, "a state");
        Assert.False(state.GetProperty("status").GetProperty("facilities").TryGetProperty("ils-07l", out _));
    }

    [Fact]
    public async Task TheHubsStateMessage_CarriesTheCapabilityPerRunwayDirection()
    {
        var states = Channel.CreateUnbounded<JsonElement>();
        var readerKey = await LiveClient.ReaderKeyAsync(_app);
        await using var hub = new HubConnectionBuilder()
            .WithUrl(new Uri(_app.BaseAddress, "/hubs/lvp"), o => o.Headers[ReadingsApi.ApiKeyHeader] = readerKey)
            .Build();
        hub.On<JsonElement>("state", s => states.Writer.TryWrite(s));
        await hub.StartAsync();
        var first = await NextStateAsync(states, _ => true);
        var directions = first.GetProperty("status").GetProperty("capability").EnumerateArray().Select(d => d.GetProperty("direction").GetString()).ToList();
        Assert.Contains("07L", directions);
        Assert.False(NamesFacility(Operation(first, "07L", "lvto"), "sb-07l"));

        using var response = await PostAsync("""{ "facilities": [ { "facility": "sb-07l", "status": "unserviceable", "reason": "bar 2 dark (invented)" } ] }""");
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);

        var after = await NextStateAsync(states, s => NamesFacility(Operation(s, "07L", "lvto"), "sb-07l"));
        Assert.False(Operation(after, "07L", "lvto").GetProperty("available").GetBoolean());
    }

    private static async Task<JsonElement> NextStateAsync(Channel<JsonElement> states, Func<JsonElement, bool> match)
    {
        using var cts = new CancellationTokenSource(TimeSpan.FromSeconds(30));
        try
        {
            while (true)
            {
                var s = await states.Reader.ReadAsync(cts.Token);
                if (match(s))
                {
                    return s;
                }
            }
        }
        catch (OperationCanceledException)
        {
            throw new Xunit.Sdk.XunitException("no matching hub state message within 30 s");
        }
    }
}
