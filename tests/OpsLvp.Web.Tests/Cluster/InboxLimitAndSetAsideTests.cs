using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// The reading inbox's limit, its behind alarm and the setting aside of a failing batch (docs/engine.md R80–R82;
/// docs/deployment.md "Readings from any node"): real apps on Kestrel on a throwaway PostgreSQL cluster. The faulty
/// batch is a real fault of the real database: a CHECK constraint the test adds to the readings table refuses one
/// invented value, as a constraint or a data error would refuse a batch in service. Readings and the profile are
/// invented (the live test profile).
/// </summary>
public sealed class InboxLimitAndSetAsideTests
{
    /// <summary>An invented RVR value (inside the profile's range, so it is accepted) that the test's constraint refuses.</summary>
    private const double Refused = 4321;

    /// <summary>Every node polls its inbox every 0.2 s, so a test waits little for a drain.</summary>
    private static readonly Dictionary<string, string?> s_fastInbox = new() { ["Cluster:InboxPollInterval"] = "00:00:00.2" };

    [PostgresFact]
    public async Task FullInbox_Answers503WithTheReason_StoresNothingOfIt_AndTakesItOnceDrained()
    {
        await using var nodes = await PostgresNodes.CreateAsync(s_fastInbox);
        var smallInbox = new Dictionary<string, string?> { ["Cluster:InboxMaxBatches"] = "2" };
        await nodes.HoldLeadershipAsync();
        var node = nodes.Start("node-b", smallInbox);
        var host = node.Services.GetRequiredService<LiveEngineHost>();
        Assert.True(host.IsStandby);

        var now = DateTimeOffset.UtcNow;
        // invented values: 1100 m, 1050 m, then 900 m (< preparation.rvrBelow 1000 m)
        Assert.Equal(HttpStatusCode.Accepted, (await StandbyPushTests.PushAsync(node, LiveClient.Item(now.AddSeconds(-3), LiveTestProfile.Tdz, "rvr", 1100))).Status);
        Assert.Equal(HttpStatusCode.Accepted, (await StandbyPushTests.PushAsync(node, LiveClient.Item(now.AddSeconds(-2), LiveTestProfile.Tdz, "rvr", 1050))).Status);
        var third = LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 900);
        var (status, body, retryAfter) = await PushWithRetryAfterAsync(node, third);

        // over the limit: 503 with the reason and Retry-After, nothing queued from it
        Assert.Equal(HttpStatusCode.ServiceUnavailable, status);
        Assert.Equal(TimeSpan.FromSeconds(OpsLvp.Web.Feeds.ReadingsApi.InboxFullRetryAfterSeconds), retryAfter);
        var error = JsonDocument.Parse(body).RootElement.GetProperty("error").GetString()!;
        Assert.Contains("the reading inbox is full (2 batch(es) wait for the leader, Cluster:InboxMaxBatches 2)", error, StringComparison.Ordinal);
        Assert.Equal(2, await nodes.InboxCountAsync());

        // counted on /health, and the NOT LIVE reason says readings are queued and the inbox is full
        var health = await node.Client.GetFromJsonAsync<JsonElement>("/health");
        var nodePart = health.GetProperty("node");
        Assert.Equal(1, nodePart.GetProperty("inboxRefused").GetInt64());
        Assert.Equal(2, nodePart.GetProperty("inboxMaxBatches").GetInt32());
        Assert.Equal(2, nodePart.GetProperty("inboxWaiting").GetInt32());
        Assert.Contains("2 reading batch(es) queued for the leader (the inbox is full", health.GetProperty("statusReason").GetString(), StringComparison.Ordinal);

        // the lock is freed: the node leads and drains the two; a standby started now takes the refused batch again
        await nodes.ReleaseLeadershipAsync();
        await Eventually.TrueAsync(() => host.State is not null, "the node to take over and restore", TimeSpan.FromSeconds(60));
        await nodes.WaitInboxEmptyAsync();
        var other = nodes.Start("node-a", smallInbox);
        Assert.True(other.Services.GetRequiredService<LiveEngineHost>().IsStandby);
        Assert.Equal(HttpStatusCode.Accepted, (await StandbyPushTests.PushAsync(other, third)).Status);
        await nodes.WaitInboxEmptyAsync();
        await Eventually.TrueAsync(() => host.State?.Phase == OpsLvp.Core.Engine.Phase.Preparation, "the 900 m to bring preparation", TimeSpan.FromSeconds(60));

        using var readings = new ReadingStore(nodes.Db.NewFactory());
        var rows = await readings.GetReceivedAsync(now.AddMinutes(-5), now.AddMinutes(5));
        // each once, in order: the refused request left nothing behind
        Assert.Equal(new[] { 1100.0, 1050.0, 900.0 }, rows.Select(r => r.Value!.Value));
        Assert.All(rows, r => Assert.True(r.Accepted));
        await LiveClient.AssertChainVerifiesAsync(node);
    }

    [PostgresFact]
    public async Task FailingBatch_IsSetAsideWithAnAuditEntryAndAnAlarm_AndTheBatchesAfterItAreEvaluated()
    {
        await using var nodes = await PostgresNodes.CreateAsync(s_fastInbox);
        await nodes.HoldLeadershipAsync();
        var node = nodes.Start("node-b", new Dictionary<string, string?> { ["Cluster:InboxSetAsideAfter"] = "2" });
        var host = node.Services.GetRequiredService<LiveEngineHost>();
        Assert.True(host.IsStandby);
        // the node has migrated the database; now the real fault
        await nodes.ExecuteAsync($"ALTER TABLE readings ADD CONSTRAINT invented_fault CHECK (value IS DISTINCT FROM {Refused})");

        var now = DateTimeOffset.UtcNow;
        foreach (var (value, ago) in new[] { (1100.0, 3), (Refused, 2), (900.0, 1) })
        {
            Assert.Equal(HttpStatusCode.Accepted, (await StandbyPushTests.PushAsync(node, LiveClient.Item(now.AddSeconds(-ago), LiveTestProfile.Tdz, "rvr", value))).Status);
        }
        var ids = await nodes.InboxIdsAsync();
        Assert.Equal(3, ids.Count);

        await nodes.ReleaseLeadershipAsync();
        await Eventually.TrueAsync(() => host.State is not null, "the node to take over and restore", TimeSpan.FromSeconds(60));
        await nodes.WaitInboxEmptyAsync();

        // the batches before and after the failing one were evaluated, the failing one was not; recording went on
        await Eventually.TrueAsync(() => host.State?.Phase == OpsLvp.Core.Engine.Phase.Preparation, "the 900 m after the set-aside batch to bring preparation", TimeSpan.FromSeconds(60));
        Assert.Null(host.Health.NotRecordingSince);
        using var readings = new ReadingStore(nodes.Db.NewFactory());
        var rows = await readings.GetReceivedAsync(now.AddMinutes(-5), now.AddMinutes(5));
        Assert.Equal(new[] { 1100.0, 900.0 }, rows.Select(r => r.Value!.Value));

        // one audit entry names the batch, its node, when it was received, how many readings and the error
        var entries = await LiveClient.EntriesAsync(node);
        var setAside = Assert.Single(entries, e => e.Kind == AuditEvents.InboxBatchSetAside);
        using var payload = JsonDocument.Parse(setAside.PayloadJson);
        var p = payload.RootElement;
        Assert.Equal(ids[1], p.GetProperty("inboxId").GetInt64());
        Assert.Equal("node-b", p.GetProperty("node").GetString());
        Assert.Equal(1, p.GetProperty("readings").GetInt32());
        Assert.Equal(2, p.GetProperty("attempts").GetInt32());
        Assert.Contains("invented_fault", p.GetProperty("error").GetString(), StringComparison.Ordinal);
        Assert.Contains("4321", p.GetProperty("body").GetString(), StringComparison.Ordinal);
        Assert.True(p.GetProperty("receivedAt").GetDateTimeOffset() <= DateTimeOffset.UtcNow);
        var transition = entries.Last(e => e.Kind == "transition" && e.PayloadJson.Contains("preparation", StringComparison.Ordinal));
        Assert.True(transition.Sequence > setAside.Sequence, "the batch after the set-aside one is evaluated after it");

        // the alarm is on the screens (the live state every page and hub client is fed from) and counted on /health
        var live = node.Services.GetRequiredService<LiveState>();
        await Eventually.TrueAsync(() => live.Current?.Status.Alarms.Any(a => a.Key == InboxAlarms.SetAsideKey) == true, "the set-aside alarm on the screens", TimeSpan.FromSeconds(30));
        var alarm = live.Current!.Status.Alarms.First(a => a.Key == InboxAlarms.SetAsideKey);
        Assert.Equal(OpsLvp.Core.Engine.AlarmKind.InboxBatchSetAside, alarm.Kind);
        Assert.Contains($"reading batch {ids[1]} ", alarm.Message, StringComparison.Ordinal);
        var health = await node.Client.GetFromJsonAsync<JsonElement>("/health");
        Assert.Equal(1, health.GetProperty("node").GetProperty("inboxSetAside").GetInt64());
        await LiveClient.AssertChainVerifiesAsync(node);
    }

    [PostgresFact]
    public async Task LeaderBehindTheInbox_ShowsTheBehindAlarm_UntilItHasDrained()
    {
        await using var nodes = await PostgresNodes.CreateAsync(s_fastInbox);
        var leader = nodes.Start("node-a", new Dictionary<string, string?>
        {
            ["Cluster:InboxAlarmAfter"] = "00:00:01",
            // the failing batch stays at the head for the whole test: far more attempts than the test waits for
            ["Cluster:InboxSetAsideAfter"] = "100",
            ["Cluster:InboxPollInterval"] = "00:00:01",
        });
        var host = leader.Services.GetRequiredService<LiveEngineHost>();
        await Eventually.TrueAsync(() => host.State is not null, "the first node to lead and restore", TimeSpan.FromSeconds(60));
        var standby = nodes.Start("node-b");
        Assert.True(standby.Services.GetRequiredService<LiveEngineHost>().IsStandby);
        await nodes.ExecuteAsync($"ALTER TABLE readings ADD CONSTRAINT invented_fault CHECK (value IS DISTINCT FROM {Refused})");

        var now = DateTimeOffset.UtcNow;
        Assert.Equal(HttpStatusCode.Accepted, (await StandbyPushTests.PushAsync(standby, LiveClient.Item(now.AddSeconds(-2), LiveTestProfile.Tdz, "rvr", Refused))).Status);
        Assert.Equal(HttpStatusCode.Accepted, (await StandbyPushTests.PushAsync(standby, LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 900))).Status);

        // the head cannot be taken: after Cluster:InboxAlarmAfter the leader's screens name what waits
        var live = leader.Services.GetRequiredService<LiveState>();
        await Eventually.TrueAsync(() => live.Current?.Status.Alarms.Any(a => a.Key == InboxAlarms.BehindKey) == true, "the behind alarm on the leader's screens", TimeSpan.FromSeconds(60));
        var alarm = live.Current!.Status.Alarms.First(a => a.Key == InboxAlarms.BehindKey);
        Assert.Equal(OpsLvp.Core.Engine.AlarmKind.InboxBehind, alarm.Kind);
        Assert.Contains("2 reading batch(es) pushed to other nodes not yet evaluated", alarm.Message, StringComparison.Ordinal);
        Assert.Contains("on node-b", alarm.Message, StringComparison.Ordinal);
        Assert.Equal(2, await nodes.InboxCountAsync());

        // the fault is repaired: the inbox drains and the alarm goes
        await nodes.ExecuteAsync("ALTER TABLE readings DROP CONSTRAINT invented_fault");
        await nodes.WaitInboxEmptyAsync();
        await Eventually.TrueAsync(() => live.Current?.Status.Alarms.All(a => a.Key != InboxAlarms.BehindKey) == true, "the behind alarm to clear", TimeSpan.FromSeconds(60));
        Assert.DoesNotContain(await LiveClient.EntriesAsync(leader), e => e.Kind == AuditEvents.InboxBatchSetAside);
    }

    private static async Task<(HttpStatusCode Status, string Body, TimeSpan? RetryAfter)> PushWithRetryAfterAsync(OpsLvpApp app, params string[] items)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + string.Join(",", items) + "] }", System.Text.Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(OpsLvp.Web.Feeds.ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        return (response.StatusCode, await response.Content.ReadAsStringAsync(), response.Headers.RetryAfter?.Delta);
    }
}
