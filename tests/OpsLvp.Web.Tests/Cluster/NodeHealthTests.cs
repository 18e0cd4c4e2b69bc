using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// <c>/health</c> says which node answers (docs/deployment.md "Which node am I: /health"): role, epoch, fan-out and
/// the last leader state heard, over real apps on Kestrel and a throwaway redis-server. <c>/health</c> stays 200 while
/// the node runs (the <c>--healthcheck</c> exit code is unchanged); <c>status</c> and <c>/health/ready</c> (503) say
/// failing while a standby cannot show live state.
/// </summary>
public sealed class NodeHealthTests
{
    [Fact]
    public async Task OneNode_IsSingle_WithNoFanout_AndReady()
    {
        var folder = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(folder);
        var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
        settings["Cluster:NodeId"] = "solo (invented)";
        try
        {
            await using var app = OpsLvpApp.Start(settings, folder);
            await AssertSingleAsync(app);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static async Task AssertSingleAsync(OpsLvpApp app)
    {
        await LiveClient.WaitForPhaseAsync(app, "normal", TimeSpan.FromSeconds(60));
        var health = await app.GetHealthAsync();
        var node = health.GetProperty("node");
        Assert.Equal("solo (invented)", node.GetProperty("id").GetString());
        Assert.Equal("single", node.GetProperty("role").GetString());
        Assert.Equal("not configured", node.GetProperty("fanout").GetString());
        Assert.Equal(JsonValueKind.Null, node.GetProperty("epoch").ValueKind);
        Assert.True(node.GetProperty("live").GetBoolean());
        Assert.Equal("ok", health.GetProperty("status").GetString());
        var (code, _) = await ReadyAsync(app);
        Assert.Equal(HttpStatusCode.OK, code);
    }

    [RedisFact]
    public async Task LeaderAndStandby_SayWhoTheyAre_AndAStandbyThatHearsNoLeader_IsFailingButAlive()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true, epoch: 7);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        await LiveClient.WaitForPhaseAsync(a.App, "normal", TimeSpan.FromSeconds(60));

        var leader = (await a.App.GetHealthAsync()).GetProperty("node");
        Assert.Equal("node-a", leader.GetProperty("id").GetString());
        Assert.Equal("leader", leader.GetProperty("role").GetString());
        Assert.Equal(7, leader.GetProperty("epoch").GetInt64());
        Assert.Equal(JsonValueKind.Null, leader.GetProperty("lastLeaderStateAt").ValueKind);
        await WaitForHealthAsync(a.App, h => h.GetProperty("node").GetProperty("fanout").GetString() == "connected", "the leader's fan-out connected");

        // the standby hears the leader's heartbeat (every 2 s) and says so
        var heard = await WaitForHealthAsync(b.App, h => h.GetProperty("node").GetProperty("live").GetBoolean(), "the standby hearing the leader");
        var standby = heard.GetProperty("node");
        Assert.Equal("node-b", standby.GetProperty("id").GetString());
        Assert.Equal("standby", standby.GetProperty("role").GetString());
        Assert.Equal(7, standby.GetProperty("epoch").GetInt64());
        Assert.Equal("connected", standby.GetProperty("fanout").GetString());
        var at = standby.GetProperty("lastLeaderStateAt").GetDateTimeOffset();
        Assert.InRange(at, DateTimeOffset.UtcNow.AddMinutes(-1), DateTimeOffset.UtcNow.AddMinutes(1));
        Assert.Equal("ok", heard.GetProperty("status").GetString());
        Assert.Equal(HttpStatusCode.OK, (await ReadyAsync(b.App)).Code);

        // no leader any more: after Cluster:LeaderSilence (2 s here) the standby cannot show live state
        a.Leadership.Set(false);
        var silent = await WaitForHealthAsync(b.App, h => h.GetProperty("status").GetString() == "failing", "the standby failing");
        Assert.False(silent.GetProperty("node").GetProperty("live").GetBoolean());
        Assert.StartsWith("NOT LIVE", silent.GetProperty("statusReason").GetString(), StringComparison.Ordinal);
        // nothing new arrives once it is failing (a heartbeat sent between the read of 'at' and the step down may still
        // have arrived before: the leader sends one every 2 s, so 'at' itself is no fixed point)
        var lastHeard = silent.GetProperty("node").GetProperty("lastLeaderStateAt").GetDateTimeOffset();
        Assert.True(lastHeard >= at, $"the last state from the leader went back from {at:o} to {lastHeard:o}");
        var (code, body) = await ReadyAsync(b.App);
        Assert.Equal(HttpStatusCode.ServiceUnavailable, code);
        Assert.Equal("failing", body.GetProperty("status").GetString());
        var still = await b.App.GetHealthAsync(); // still 200: --healthcheck keeps the node (restarting it would not bring a leader)
        Assert.Equal(lastHeard, still.GetProperty("node").GetProperty("lastLeaderStateAt").GetDateTimeOffset());
        Assert.Equal("failing", still.GetProperty("status").GetString());
    }

    [RedisFact]
    public async Task AStandbyWhoseRedisIsUnreachable_SaysSo()
    {
        using var refusing = LocalServices.RefusingPort(out var port); // held for the test: no server another test starts can take it
        await using var b = ClusterNode.Start("node-b", $"127.0.0.1:{port},connectTimeout=500", leader: false);

        var health = await WaitForHealthAsync(b.App, h => h.GetProperty("node").GetProperty("fanout").GetString() == "unreachable", "fan-out unreachable");
        Assert.Equal("standby", health.GetProperty("node").GetProperty("role").GetString());
        Assert.Equal("failing", health.GetProperty("status").GetString());
        Assert.Contains("Cluster:Redis not reachable", health.GetProperty("statusReason").GetString(), StringComparison.Ordinal);
        Assert.Equal(JsonValueKind.Null, health.GetProperty("node").GetProperty("epoch").ValueKind);
    }

    /// <summary>Polls <c>/health</c> until <paramref name="done"/> holds (generous deadline for a loaded machine).</summary>
    private static async Task<JsonElement> WaitForHealthAsync(OpsLvpApp app, Func<JsonElement, bool> done, string what)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(30);
        while (true)
        {
            var health = await app.GetHealthAsync();
            if (done(health))
            {
                return health;
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"timed out waiting for {what}; last /health: {health}");
            }
            await Task.Delay(100);
        }
    }

    private static async Task<(HttpStatusCode Code, JsonElement Body)> ReadyAsync(OpsLvpApp app)
    {
        using var response = await app.Client.GetAsync(new Uri("/health/ready", UriKind.Relative));
        return (response.StatusCode, await response.Content.ReadFromJsonAsync<JsonElement>());
    }
}
