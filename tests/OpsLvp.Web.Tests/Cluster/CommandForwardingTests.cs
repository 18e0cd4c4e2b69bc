using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;
using StackExchange.Redis;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// Commands from a node that does not lead (docs/deployment.md "Fan-out and commands between nodes"), over two real
/// apps on one throwaway redis-server: carried out once by the leader through its normal path with the outcome
/// returned, and "not applied" after the timeout with no leader — never applied later. Names are invented.
/// </summary>
public sealed class CommandForwardingTests
{
    private static readonly CommandCaller s_dutyManager = new("r.vale (invented)", new HashSet<string> { Roles.DutyManager }, new HashSet<string>(), true);

    [RedisFact]
    public async Task CommandOnTheStandby_IsAppliedOnceByTheLeader_AndTheStandbyGetsItsOutcome()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 2); // every node (and listener) subscribed: a command sent sooner is lost or refused
        await LiveClient.WaitForPhaseAsync(a.App, "normal", TimeSpan.FromSeconds(60));

        var outcome = await Commands(b).ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));

        Assert.True(outcome.Applied, outcome.Message);
        Assert.Equal("deterioration forecast set", outcome.Message); // the leader's own words for it
        var onA = (await LiveClient.EntriesAsync(a.App)).Where(e => e.Actor == s_dutyManager.Name).ToList();
        var entry = Assert.Single(onA);
        Assert.Equal(outcome.AuditSequence, entry.Sequence);
        Assert.DoesNotContain(await LiveClient.EntriesAsync(b.App), e => e.Actor == s_dutyManager.Name);
        await LiveClient.AssertChainVerifiesAsync(a.App);
    }

    [RedisFact]
    public async Task CommandOnTheStandby_IsRefusedByTheLeadersChecks_WithTheLeadersReason()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 2); // every node (and listener) subscribed: a command sent sooner is lost or refused
        var viewer = new CommandCaller("v.iewer (invented)", new HashSet<string> { Roles.Viewer }, new HashSet<string>(), true);

        var outcome = await Commands(b).ExecuteAsync(viewer, new SetForecast("", true, "no right to (invented)"));

        Assert.Equal(CommandOutcomeKind.Refused, outcome.Kind);
        var local = await a.App.Services.GetRequiredService<LvpCommandService>().ExecuteAsync(viewer, new SetForecast("", true, "no right to (invented)"));
        Assert.Equal(local.Message, outcome.Message);
    }

    [RedisFact]
    public async Task WithNoLeader_TheStandbyAnswersNotApplied_AndALaterLeaderDoesNotApplyIt()
    {
        using var redis = await RedisServerProcess.StartAsync();
        var fast = new Dictionary<string, string?> { ["Cluster:CommandTimeout"] = "00:00:01" };
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: false, settings: fast);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false, settings: fast);
        // listen on the command channel as a node would, to deliver the request again later (a late delivery)
        await using var spy = await ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        var requests = await spy.GetSubscriber().SubscribeAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel));
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 3); // every node (and listener) subscribed: a command sent sooner is lost or refused

        var outcome = await Commands(b).ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));

        Assert.Equal(CommandOutcomeKind.Failed, outcome.Kind);
        Assert.StartsWith("not applied", outcome.Message, StringComparison.Ordinal);
        using var cts = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        var late = await requests.ReadAsync(cts.Token);

        // A leads now and receives the withdrawn command again, then a new one from B
        a.Leadership.Set(true, epoch: 2);
        await spy.GetSubscriber().PublishAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel), late.Message);
        var after = await Commands(b).ExecuteAsync(s_dutyManager, new ReleaseForecast("", "TAF amended (invented)"));

        // A carries out commands one at a time in order, so the withdrawn one was handled before this answer
        Assert.True(after.Kind != CommandOutcomeKind.Failed, after.Message);
        var onA = (await LiveClient.EntriesAsync(a.App)).Where(e => e.Actor == s_dutyManager.Name).ToList();
        var entry = Assert.Single(onA);
        Assert.Equal(after.AuditSequence, entry.Sequence);
        Assert.DoesNotContain("\"on\":true", entry.PayloadJson, StringComparison.OrdinalIgnoreCase);
    }

    private static ILvpCommandService Commands(ClusterNode node) => node.App.Services.GetRequiredService<ILvpCommandService>();
}
