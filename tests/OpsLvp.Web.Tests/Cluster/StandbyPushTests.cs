using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using System.Threading.Channels;
using Microsoft.AspNetCore.SignalR.Client;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// Readings pushed to a standby node are handed over to the leader through the reading inbox (docs/engine.md R73–R75;
/// docs/deployment.md "Readings from any node"): two real apps (Kestrel on 127.0.0.1) on one database of a throwaway
/// PostgreSQL cluster, a real SignalR client on the leader. Readings and the profile are invented (the live test profile).
/// </summary>
public sealed class StandbyPushTests
{
    [PostgresFact]
    public async Task PushToTheStandby_Is202WithEachOutcome_ReachesTheLeadersHub_AndIsStoredOnce()
    {
        await using var nodes = await PostgresNodes.CreateAsync();
        var (leader, standby) = await nodes.StartTwoAsync();
        var states = Channel.CreateUnbounded<JsonElement>();
        var readerKey = await LiveClient.ReaderKeyAsync(leader);
        await using var hub = new HubConnectionBuilder().WithUrl(new Uri(leader.BaseAddress, "/hubs/lvp"), o => o.Headers[OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header] = readerKey).Build();
        hub.On<JsonElement>("state", s => states.Writer.TryWrite(s));
        await hub.StartAsync();

        var now = DateTimeOffset.UtcNow;
        // 900 m < preparation.rvrBelow 1000 m, enter dwell 0 s (invented test profile); each other item is rejected
        // for one reason of the engine's screen (RVR range 0..10 000 m; an RVR system gives no cloud base)
        var (status, body) = await PushAsync(standby,
            LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 900),
            LiveClient.Item(now.AddSeconds(-1), "t-unknown", "rvr", 800),
            LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "cloud_base", 800),
            LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 20000),
            LiveClient.Item(now.AddHours(1), LiveTestProfile.Tdz, "rvr", 900),
            LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 900, "failed"),
            """{ "sensor": "t-tdz", "kind": "rvr" }""");

        Assert.Equal(HttpStatusCode.Accepted, status);
        using var answer = JsonDocument.Parse(body);
        Assert.Equal(1, answer.RootElement.GetProperty("accepted").GetInt32());
        var reasons = answer.RootElement.GetProperty("rejected").EnumerateArray()
            .ToDictionary(r => r.GetProperty("index").GetInt32(), r => r.GetProperty("reason").GetString());
        Assert.Equal(
            new Dictionary<int, string?> { [1] = "unknown_sensor", [2] = "kind_not_produced", [3] = "out_of_range", [4] = "future_dated", [5] = "status_not_ok", [6] = "malformed" },
            reasons);

        // evaluated by the leader: its hub client sees the phase the reading brings and the reading itself
        var pushed = await NextAsync(states, s => LiveClient.Phase(s) == "preparation");
        Assert.Equal(900, pushed.GetProperty("status").GetProperty("governingRvr").GetProperty("value").GetDouble());

        // stored exactly once as accepted, by the leader; the rejected items are recorded with their reasons, never as accepted
        await nodes.WaitInboxEmptyAsync();
        using var readings = new ReadingStore(nodes.Db.NewFactory());
        IReadOnlyList<ReceivedReading> rows = await readings.GetReceivedAsync(now.AddMinutes(-5), now.AddMinutes(5));
        rows = [.. rows.Where(r => r.Source == "push:live-test")];
        var accepted = Assert.Single(rows, r => r.Accepted);
        Assert.Equal((LiveTestProfile.Tdz, 900.0, "push:live-test"), (accepted.Sensor, accepted.Value!.Value, accepted.Source));
        var recordedReasons = rows.Where(r => !r.Accepted).Select(r => r.RejectReason!.Value).Order().ToList();
        Assert.Equal(
            new[] { OpsLvp.Core.Readings.RejectReason.Malformed, OpsLvp.Core.Readings.RejectReason.StatusNotOk, OpsLvp.Core.Readings.RejectReason.OutOfRange,
                OpsLvp.Core.Readings.RejectReason.FutureDated, OpsLvp.Core.Readings.RejectReason.UnknownSensor, OpsLvp.Core.Readings.RejectReason.KindNotProduced }.Order(),
            recordedReasons);
        Assert.True(leader.Services.GetRequiredService<ReadingInboxDrain>().Drained >= 1);
        Assert.Equal(0, standby.Services.GetRequiredService<ReadingInboxDrain>().Drained);
        await LiveClient.AssertChainVerifiesAsync(leader);
    }

    [PostgresFact]
    public async Task ManyBatchesToTheStandby_InSequence_AreStoredByTheLeaderInThatOrder()
    {
        await using var nodes = await PostgresNodes.CreateAsync();
        var (_, standby) = await nodes.StartTwoAsync();

        var start = DateTimeOffset.UtcNow.AddMinutes(-2);
        const int batches = 40;
        for (var i = 0; i < batches; i++)
        {
            // invented values: 1500 m and up, one a batch, times one second apart
            var (status, body) = await PushAsync(standby, LiveClient.Item(start.AddSeconds(i), LiveTestProfile.Tdz, "rvr", 1500 + i));
            Assert.True(status == HttpStatusCode.Accepted, $"batch {i}: {(int)status} {body}");
        }

        await nodes.WaitInboxEmptyAsync();
        using var readings = new ReadingStore(nodes.Db.NewFactory());
        var rows = await readings.GetReceivedAsync(start.AddMinutes(-10), start.AddMinutes(10));
        var values = rows.Where(r => r.Sensor == LiveTestProfile.Tdz).Select(r => r.Value!.Value).ToList();
        // in the order sent (insertion order of the readings table), each once, all accepted
        Assert.Equal(Enumerable.Range(0, batches).Select(i => 1500.0 + i), values);
        Assert.All(rows.Where(r => r.Sensor == LiveTestProfile.Tdz), r => Assert.True(r.Accepted, $"{r.Value}: {r.RejectReason} {r.RejectDetail}"));
    }

    [PostgresFact]
    public async Task WithNoLeader_PushesToTheStandbyAre202_AndTheNextLeaderEvaluatesThemAfterItsRestore()
    {
        await using var nodes = await PostgresNodes.CreateAsync();
        // the leader is absent: the test holds the leadership lock itself, as a node that froze would
        await nodes.HoldLeadershipAsync();
        var node = nodes.Start("node-b");
        var host = node.Services.GetRequiredService<LiveEngineHost>();
        Assert.True(host.IsStandby);

        var now = DateTimeOffset.UtcNow;
        // invented values: 1100 m then 900 m (< preparation.rvrBelow 1000 m)
        Assert.Equal(HttpStatusCode.Accepted, (await PushAsync(node, LiveClient.Item(now.AddSeconds(-2), LiveTestProfile.Tdz, "rvr", 1100))).Status);
        Assert.Equal(HttpStatusCode.Accepted, (await PushAsync(node, LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 900))).Status);
        Assert.Equal(2, await nodes.InboxCountAsync());
        // the standby's /health says what waits, and since when (docs/deployment.md "Which node am I")
        var health = await node.Client.GetFromJsonAsync<System.Text.Json.JsonElement>("/health");
        var nodePart = health.GetProperty("node");
        Assert.Equal(2, nodePart.GetProperty("inboxWaiting").GetInt32());
        Assert.True(nodePart.GetProperty("inboxOldestReceivedAt").GetDateTimeOffset() <= DateTimeOffset.UtcNow);
        using var readings = new ReadingStore(nodes.Db.NewFactory());
        Assert.Empty(await readings.GetReceivedAsync(now.AddMinutes(-5), now.AddMinutes(5)));
        Assert.Null(host.State);

        // the lock is freed: the standby takes over, restores, and then takes what waited
        await nodes.ReleaseLeadershipAsync();
        await Eventually.TrueAsync(() => host.State is not null, "the standby to take over and restore", TimeSpan.FromSeconds(60));
        await Eventually.TrueAsync(() => host.State?.Phase == OpsLvp.Core.Engine.Phase.Preparation, "the inbox's 900 m to bring preparation", TimeSpan.FromSeconds(60));
        await nodes.WaitInboxEmptyAsync();
        var rows = await readings.GetReceivedAsync(now.AddMinutes(-5), now.AddMinutes(5));
        Assert.Equal(new[] { 1100.0, 900.0 }, rows.Select(r => r.Value!.Value));
        Assert.All(rows, r => Assert.True(r.Accepted));
        // the inbox batches were evaluated after the restore's engine_started, in the new leader's epoch
        var entries = await LiveClient.EntriesAsync(node);
        var started = entries.Last(e => e.Kind == "engine_started").Sequence;
        Assert.Contains(entries, e => e.Sequence > started && e.Kind == "transition" && e.PayloadJson.Contains("preparation", StringComparison.Ordinal));
        await LiveClient.AssertChainVerifiesAsync(node);
    }

    internal static async Task<(HttpStatusCode Status, string Body)> PushAsync(OpsLvpApp app, params string[] items)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + string.Join(",", items) + "] }", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        return (response.StatusCode, await response.Content.ReadAsStringAsync());
    }

    private static Task<JsonElement> NextAsync(Channel<JsonElement> states, Func<JsonElement, bool> match) =>
        StateChannels.NextAsync(states, match);
}
