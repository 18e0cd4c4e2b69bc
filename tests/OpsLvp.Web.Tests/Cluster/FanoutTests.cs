using System.Net.Http.Json;
using System.Text.Json;
using System.Threading.Channels;
using Microsoft.AspNetCore.SignalR;
using Microsoft.AspNetCore.SignalR.Client;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// Two real apps on Kestrel on one throwaway redis-server (docs/deployment.md "Fan-out and commands between nodes"):
/// the SignalR backplane, the leader's snapshots on the standby's <c>/api/state</c> and hub, and NOT LIVE on a standby
/// that hears nothing. Readings are invented.
/// </summary>
public sealed class FanoutTests
{
    private static readonly TimeSpan s_wait = TimeSpan.FromSeconds(60);

    [RedisFact]
    public async Task Backplane_AMessageSentOnA_ReachesAHubClientOfB()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        var got = Channel.CreateUnbounded<string>();
        await using var hub = await ConnectAsync(b.App);
        hub.On<string>("probe", text => got.Writer.TryWrite(text));

        // sent only through A's hub context: B's client can get it only over Redis
        var context = a.App.Services.GetRequiredService<IHubContext<LvpHub>>();
        using var cts = new CancellationTokenSource(s_wait);
        string? received = null;
        while (received is null)
        {
            await context.Clients.All.SendAsync("probe", "from node-a", cts.Token);
            using var step = CancellationTokenSource.CreateLinkedTokenSource(cts.Token);
            step.CancelAfter(TimeSpan.FromSeconds(1)); // the subscription of B's backplane may still be starting
            try
            {
                received = await got.Reader.ReadAsync(step.Token);
            }
            catch (OperationCanceledException) when (!cts.IsCancellationRequested)
            {
            }
        }
        Assert.Equal("from node-a", received);
    }

    [RedisFact]
    public async Task ReadingPushedToTheLeader_ShowsOnTheStandbysApiAndHub_AndSilence_ShowsNotLive()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true, epoch: 3);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        var states = Channel.CreateUnbounded<JsonElement>();
        await using var hub = await ConnectAsync(b.App);
        hub.On<JsonElement>(LvpHub.StateMethod, s => states.Writer.TryWrite(s));

        // 900 m < preparation.rvrBelow 1000 m, enter dwell 0 s (invented test profile); B's own engine never sees it
        await LiveClient.PushAsync(a.App, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 900));

        var onHub = await NextAsync(states, s => LiveClient.Phase(s) == "preparation");
        Assert.Equal(900, onHub.GetProperty("status").GetProperty("governingRvr").GetProperty("value").GetDouble());
        var onApi = await LiveClient.WaitForPhaseAsync(b.App, "preparation", s_wait);
        Assert.True(onApi.GetProperty("recording").GetProperty("recording").GetBoolean());
        var live = b.App.Services.GetRequiredService<LiveState>();
        Assert.Equal(3, live.CurrentEpoch);
        // B is a standby: its own engine never evaluated, so nothing of its own was published (docs/engine.md R70)
        Assert.Null(live.OwnLatest);

        // the leader stops leading: nothing more arrives, and after Cluster:LeaderSilence (2 s here) B says so
        a.Leadership.Set(false);
        var marked = await WaitForAsync(b.App, s => !s.GetProperty("recording").GetProperty("recording").GetBoolean());
        var recording = marked.GetProperty("recording");
        Assert.Equal(OpsLvp.Core.Presentation.NodeWords.NotLiveHeadline, recording.GetProperty("headline").GetString());
        Assert.Contains("not live", recording.GetProperty("reason").GetString(), StringComparison.Ordinal);
        Assert.Equal("preparation", LiveClient.Phase(marked)); // the last state received, marked, not hidden
        var markedOnHub = await NextAsync(states, s => !s.GetProperty("recording").GetProperty("recording").GetBoolean());
        Assert.Equal("NOT LIVE", markedOnHub.GetProperty("recording").GetProperty("headline").GetString());

        // a leader again (a new epoch): B shows it live again
        a.Leadership.Set(true, epoch: 4);
        await LiveClient.PushAsync(a.App, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 850));
        var again = await WaitForAsync(b.App, s => s.GetProperty("recording").GetProperty("recording").GetBoolean()
            && s.GetProperty("status").GetProperty("governingRvr") is { ValueKind: JsonValueKind.Object } governing // null until a reading is evaluated
            && governing.GetProperty("value").GetDouble() == 850);
        Assert.Equal(4, live.CurrentEpoch);
        Assert.Equal("preparation", LiveClient.Phase(again));
    }

    /// <remarks>
    /// The standby's screens say how many reading batches wait in its reading inbox for a leader, and follow the count
    /// while they stay NOT LIVE. The nodes here run on SQLite (no standby takes pushes there), so the batches are written
    /// into the standby's real reading inbox table (its <see cref="OpsLvp.Data.Stores.ReadingInboxStore"/> writes only on
    /// PostgreSQL), as a push to a standby on PostgreSQL leaves them (docs/engine.md R73). Invented readings.
    /// </remarks>
    [RedisFact]
    public async Task NotLive_NamesTheReadingBatchesQueuedInTheInbox_AndFollowsTheCount()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true, epoch: 3);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        await LiveClient.PushAsync(a.App, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 900));
        await LiveClient.WaitForPhaseAsync(b.App, "preparation", s_wait);
        await AddToInboxAsync(b.App, InboxRow(0), InboxRow(1));

        a.Leadership.Set(false);
        var marked = await WaitForAsync(b.App, s => !s.GetProperty("recording").GetProperty("recording").GetBoolean()
            && (s.GetProperty("recording").GetProperty("reason").GetString() ?? "").Contains("batch", StringComparison.Ordinal));
        Assert.Equal(OpsLvp.Core.Presentation.NodeWords.NotLiveHeadline, marked.GetProperty("recording").GetProperty("headline").GetString());
        Assert.Contains("2 reading batches are queued for the leader", marked.GetProperty("recording").GetProperty("reason").GetString(), StringComparison.Ordinal);

        await AddToInboxAsync(b.App, InboxRow(2));
        var followed = await WaitForAsync(b.App, s => (s.GetProperty("recording").GetProperty("reason").GetString() ?? "")
            .Contains("3 reading batches are queued for the leader", StringComparison.Ordinal));
        Assert.False(followed.GetProperty("recording").GetProperty("recording").GetBoolean());
        Assert.Equal("NOT LIVE", followed.GetProperty("recording").GetProperty("headline").GetString());
    }

    private static async Task AddToInboxAsync(OpsLvpApp app, params OpsLvp.Data.Entities.ReadingInboxRow[] rows)
    {
        var factory = app.Services.GetRequiredService<Microsoft.EntityFrameworkCore.IDbContextFactory<OpsLvp.Data.OpsLvpDbContext>>();
        await using var db = await factory.CreateDbContextAsync();
        db.ReadingInbox.AddRange(rows);
        await db.SaveChangesAsync();
    }

    private static OpsLvp.Data.Entities.ReadingInboxRow InboxRow(int i) => new()
    {
        ReceivedAt = DateTimeOffset.UtcNow,
        Source = "push:invented",
        NodeId = "node-b",
        Body = "{ \"readings\": [" + LiveClient.Item(DateTimeOffset.UtcNow.AddSeconds(-i), LiveTestProfile.Tdz, "rvr", 1500) + "] }",
        Accepted = 1,
        Rejected = 0,
    };

    [RedisFact]
    public async Task EveryHubClient_OnEitherNode_GetsEachStateOnce()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        var onA = new System.Collections.Concurrent.ConcurrentQueue<JsonElement>();
        var onB = new System.Collections.Concurrent.ConcurrentQueue<JsonElement>();
        await using var hubA = await ConnectAsync(a.App);
        await using var hubB = await ConnectAsync(b.App);
        hubA.On<JsonElement>(LvpHub.StateMethod, s => onA.Enqueue(s.Clone()));
        hubB.On<JsonElement>(LvpHub.StateMethod, s => onB.Enqueue(s.Clone()));

        // Invented values well above every threshold (normal); each is a new state with its own version.
        double[] values = [1500, 1510, 1520, 1530, 1540];
        foreach (var value in values)
        {
            await LiveClient.PushAsync(a.App, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", value));
            await Task.Delay(300);
        }
        using var cts = new CancellationTokenSource(s_wait);
        while (!(HasValue(onA, values[^1]) && HasValue(onB, values[^1])))
        {
            await Task.Delay(100, cts.Token);
        }
        await Task.Delay(TimeSpan.FromSeconds(2)); // a second copy, if one were coming, arrives within this

        foreach (var (node, states) in new[] { ("node-a", onA), ("node-b", onB) })
        {
            var twice = states.GroupBy(s => (s.GetProperty("version").GetInt64(), s.GetProperty("recording").GetProperty("recording").GetBoolean()))
                .Where(g => g.Count() > 1).Select(g => $"version {g.Key.Item1} x{g.Count()}").ToList();
            Assert.True(twice.Count == 0, $"a client of {node} got a state more than once: {string.Join(", ", twice)} (of {states.Count})");
        }

        // a state without a governing RVR (null: none yet, e.g. the one a hub client gets on connecting before the first
        // reading is evaluated) is simply not the one waited for
        static bool HasValue(IEnumerable<JsonElement> states, double value) =>
            states.Any(s => s.GetProperty("status").GetProperty("governingRvr") is { ValueKind: JsonValueKind.Object } governing
                && governing.TryGetProperty("value", out var v) && v.ValueKind == JsonValueKind.Number && v.GetDouble() == value);
    }

    [RedisFact]
    public async Task OnTheStandby_ASnapshotOlderThanTheOneShown_ArrivingLate_IsDropped()
    {
        // The standby handles snapshot messages as StackExchange.Redis hands them over, not through an ordered queue,
        // so a late older one must not replace a newer one (LiveState.ApplyRemote compares epoch, then version).
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true, epoch: 2);
        // no rate limit worth the name on B's subscribers, so every snapshot made current reaches its hub client
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false, settings: new Dictionary<string, string?> { ["Live:MaxStatesPerSecond"] = "1000" });
        var live = b.App.Services.GetRequiredService<LiveState>();
        var versions = new System.Collections.Concurrent.ConcurrentQueue<long>();
        await using var hub = await ConnectAsync(b.App);
        hub.On<JsonElement>(LvpHub.StateMethod, s => versions.Enqueue(s.GetProperty("version").GetInt64()));

        // a real snapshot of the leader's engine (invented reading), as the template of the messages below
        await LiveClient.PushAsync(a.App, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 1500));
        await WaitUntilAsync(() => live.Current is not null, "the leader's first state on the standby");
        var template = live.Current!;
        var baseVersion = template.Version + 1_000_000; // far above anything the idle leader publishes meanwhile

        // published as by another leading node straight onto the channel the nodes use
        await using var publisher = await StackExchange.Redis.ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        var channel = StackExchange.Redis.RedisChannel.Literal("opslvp:" + OpsLvp.Web.Cluster.SnapshotFanout.ChannelName);
        async Task PublishAsync(long epoch, long version) =>
            await publisher.GetSubscriber().PublishAsync(channel, JsonSerializer.SerializeToUtf8Bytes(
                new OpsLvp.Web.Cluster.SnapshotMessage("node-x", epoch, template with { Version = version }), LiveJson.Options));

        await PublishAsync(2, baseVersion + 100);
        await WaitUntilAsync(() => live.Current?.Version == baseVersion + 100, "the newer snapshot on the standby");
        await PublishAsync(2, baseVersion + 50);  // same epoch, older version: late
        await Task.Delay(300);
        await PublishAsync(1, baseVersion + 200); // older epoch (a former leader), higher version: late
        await Task.Delay(300);
        await PublishAsync(2, baseVersion + 101); // newer: shown
        await WaitUntilAsync(() => live.Current?.Version == baseVersion + 101 && versions.Contains(baseVersion + 101), "the newest snapshot on the standby and its hub");
        await Task.Delay(TimeSpan.FromSeconds(1)); // a late one, were it shown, reaches the hub client within this

        Assert.Equal(baseVersion + 101, live.Current!.Version);
        Assert.Equal(2, live.CurrentEpoch);
        Assert.DoesNotContain(baseVersion + 50, versions);
        Assert.DoesNotContain(baseVersion + 200, versions);
        Assert.Contains(baseVersion + 100, versions);
    }

    private static async Task WaitUntilAsync(Func<bool> condition, string what)
    {
        using var cts = new CancellationTokenSource(s_wait);
        while (!condition())
        {
            try
            {
                await Task.Delay(50, cts.Token);
            }
            catch (OperationCanceledException)
            {
                throw new TimeoutException($"waited {s_wait.TotalSeconds} s for {what}");
            }
        }
    }

    [RedisFact]
    public async Task UnreachableRedis_TheNodeStarts_AndAStandbySaysItIsNotLive()
    {
        // a port nothing listens on: the node must run and say it cannot fan out, not refuse to start
        using var refusing = LocalServices.RefusingPort(out var port); // held for the test: no server another test starts can take it
        await using var b = ClusterNode.Start("node-b", $"127.0.0.1:{port},connectTimeout=500", leader: false);
        var health = await b.App.GetHealthAsync();
        Assert.NotEqual(JsonValueKind.Undefined, health.ValueKind);
        // a standby never evaluates (docs/engine.md R70) and has heard no leader: no state to show, and it says why
        using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/api/state", UriKind.Relative));
        request.Headers.Add(OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header, await LiveClient.ReaderKeyAsync(b.App));
        using var response = await b.App.Client.SendAsync(request);
        Assert.Equal(System.Net.HttpStatusCode.ServiceUnavailable, response.StatusCode);
        var detail = (await response.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("detail").GetString();
        Assert.Contains("standby", detail, StringComparison.Ordinal);
        Assert.Contains("no state from the leading node", detail, StringComparison.Ordinal);
    }

    [Fact]
    public void MalformedRedisSetting_StopsTheStart_NamingTheSetting()
    {
        var error = Assert.ThrowsAny<Exception>(() => ClusterNode.Start("node-x", "127.0.0.1:1,nosuchoption=1", leader: true));
        Assert.Contains("Cluster:Redis", Flatten(error), StringComparison.Ordinal);
    }

    private static string Flatten(Exception ex) => ex.InnerException is null ? ex.Message : ex.Message + " | " + Flatten(ex.InnerException);

    private static async Task<HubConnection> ConnectAsync(OpsLvpApp app)
    {
        var key = await LiveClient.ReaderKeyAsync(app);
        var hub = new HubConnectionBuilder()
            .WithUrl(new Uri(app.BaseAddress, LiveApi.HubPath), o => o.Headers[OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header] = key)
            .Build();
        await hub.StartAsync();
        return hub;
    }

    private static Task<JsonElement> NextAsync(Channel<JsonElement> states, Func<JsonElement, bool> match) =>
        StateChannels.NextAsync(states, match, s_wait);

    /// <summary>Polls GET /api/state (503 until a first state) until <paramref name="match"/> holds.</summary>
    private static async Task<JsonElement> WaitForAsync(OpsLvpApp app, Func<JsonElement, bool> match)
    {
        var deadline = DateTime.UtcNow + s_wait;
        var key = await LiveClient.ReaderKeyAsync(app);
        while (true)
        {
            using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/api/state", UriKind.Relative));
            request.Headers.Add(OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header, key);
            using var response = await app.Client.SendAsync(request);
            if (response.IsSuccessStatusCode)
            {
                var state = JsonDocument.Parse(await response.Content.ReadAsStringAsync()).RootElement.Clone();
                if (match(state))
                {
                    return state;
                }
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"GET /api/state never matched (last status {(int)response.StatusCode})");
            }
            await Task.Delay(100);
        }
    }
}
