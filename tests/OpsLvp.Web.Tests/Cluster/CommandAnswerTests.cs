using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;
using OpsLvp.Web.Time;
using StackExchange.Redis;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// A command from a node that does not lead is answered whenever the leader does not carry it out for a reason the
/// person should know (docs/engine.md R85, docs/deployment.md "Fan-out and commands between nodes"): the sending node's
/// clock set wrong, or a command the leader cannot read. Real apps on Kestrel, a real redis-server; the sending node's
/// real clock is set off by a stand-in <see cref="TimeProvider"/> (a host whose time synchronisation failed). The
/// timeouts are long (30 s), so an answer that says why can only come from the leader, never from the timeout. Names
/// are invented.
/// </summary>
public sealed class CommandAnswerTests
{
    private static readonly CommandCaller s_dutyManager = new("r.vale (invented)", new HashSet<string> { Roles.DutyManager }, new HashSet<string>(), true);

    private static readonly Dictionary<string, string?> s_slowTimeout = new() { ["Cluster:CommandTimeout"] = "00:00:30" };

    [RedisFact]
    public Task AStandbyWhoseClockIsAhead_IsToldWhy_NotLeftToTheTimeout() =>
        SkewedStandbyIsToldWhyAsync(TimeSpan.FromSeconds(40), "ahead of the engine node node-a");

    [RedisFact]
    public Task AStandbyWhoseClockIsBehind_IsToldWhy_NotLeftToTheTimeout() =>
        // 90 s behind: older than the timeout (30 s) plus the 5 s allowed by the time it arrives
        SkewedStandbyIsToldWhyAsync(TimeSpan.FromSeconds(-90), "the clocks of node-b and node-a differ");

    private static async Task SkewedStandbyIsToldWhyAsync(TimeSpan skew, string expected)
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true, settings: s_slowTimeout);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false, settings: s_slowTimeout,
            services: s => s.AddKeyedSingleton<TimeProvider>(TimeServiceCollectionExtensions.NetworkClockKey, new OffsetClock(skew)));
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 2); // every node (and listener) subscribed: a command sent sooner is lost or refused
        await LiveClient.WaitForPhaseAsync(a.App, "normal", TimeSpan.FromSeconds(60));
        await using var observer = await ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        var forwarding = a.App.Services.GetRequiredService<CommandForwarding>();

        var outcome = await b.App.Services.GetRequiredService<ILvpCommandService>().ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));

        Assert.Equal(CommandOutcomeKind.Refused, outcome.Kind);
        Assert.StartsWith("not applied: ", outcome.Message, StringComparison.Ordinal);
        Assert.Contains(expected, outcome.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("no engine node answered", outcome.Message, StringComparison.Ordinal);
        Assert.Null(outcome.AuditSequence);
        // refused on the leader as R77 says: counted and logged, not carried out, not audited
        Assert.Equal(1, forwarding.Refusals);
        Assert.DoesNotContain(await LiveClient.EntriesAsync(a.App), e => e.Actor == s_dutyManager.Name);
        // the answer is in the command's key too, so the command can be neither claimed nor withdrawn afterwards
        var key = Assert.Single(((RedisResult[])(await observer.GetDatabase().ExecuteAsync("KEYS", "opslvp:command:*"))!).Select(k => (string)k!));
        Assert.StartsWith("done:", (string?)await observer.GetDatabase().StringGetAsync(key), StringComparison.Ordinal);
    }

    [RedisFact]
    public async Task ACommandTheLeaderCannotRead_IsAnsweredNotApplied_AndLoggedWithItsIdAndKind()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 2); // every node (and listener) subscribed: a command sent sooner is lost or refused
        await LiveClient.WaitForPhaseAsync(a.App, "normal", TimeSpan.FromSeconds(60));
        using var log = new CapturingLoggerProvider();
        a.App.Services.GetRequiredService<ILoggerFactory>().AddProvider(log);
        await using var observer = await ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        var outcomes = await observer.GetSubscriber().SubscribeAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.OutcomesChannel));
        var seal = b.App.Services.GetRequiredService<ClusterSeal>();

        // sealed by node B as a node of another version might send it: the roles list missing (null)
        var id = Guid.NewGuid().ToString("N");
        var command = JsonSerializer.SerializeToNode(
            ForwardedCommand.From(id, "node-b", s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"), DateTimeOffset.UtcNow), LiveJson.Options)!.AsObject();
        var roles = Assert.Single(command, p => string.Equals(p.Key, "roles", StringComparison.OrdinalIgnoreCase)).Key;
        command[roles] = null;
        await observer.GetDatabase().StringSetAsync("opslvp:command:" + id, "pending", TimeSpan.FromHours(1));
        await observer.GetSubscriber().PublishAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel), seal.SealCommand(command.ToJsonString()));

        using var cts = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        var answer = JsonSerializer.Deserialize<ForwardedOutcome>(seal.OpenOutcome((string)(await outcomes.ReadAsync(cts.Token)).Message!, out _)!, LiveJson.Options)!;

        Assert.Equal(id, answer.Id);
        Assert.Equal("node-a", answer.Node);
        Assert.Equal(CommandOutcomeKind.Failed, answer.Kind);
        Assert.StartsWith("not applied: the engine node node-a could not read the command", answer.Message, StringComparison.Ordinal);
        Assert.Null(answer.AuditSequence);
        Assert.StartsWith("done:", (string?)await observer.GetDatabase().StringGetAsync("opslvp:command:" + id), StringComparison.Ordinal);
        Assert.Contains(log.Lines, l => l.Level == LogLevel.Error && l.Message.Contains(id, StringComparison.Ordinal) && l.Message.Contains(nameof(SetForecast), StringComparison.Ordinal));
        Assert.DoesNotContain(await LiveClient.EntriesAsync(a.App), e => e.Actor == s_dutyManager.Name);

        // the channel goes on: a genuine command from B is applied after it
        var genuine = await b.App.Services.GetRequiredService<ILvpCommandService>().ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        Assert.True(genuine.Applied, genuine.Message);
    }

    [RedisFact]
    public async Task AnAnswerAfterTheStandbysTimeout_IsShownWhileItWaits_AndLoggedWhenItCameTooLate()
    {
        using var redis = await RedisServerProcess.StartAsync();
        // no node leads: the test takes the commands as a slow leader would (claims the key, answers late), sealing with
        // the installation's key ring; 8 s timeouts leave the test's own steps seconds of slack on a loaded machine
        var timeout = TimeSpan.FromSeconds(8);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false, settings: new Dictionary<string, string?> { ["Cluster:CommandTimeout"] = "00:00:08" });
        using var log = new CapturingLoggerProvider();
        b.App.Services.GetRequiredService<ILoggerFactory>().AddProvider(log);
        await using var slowLeader = await ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        var requests = await slowLeader.GetSubscriber().SubscribeAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel));
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 2); // every node (and listener) subscribed: a command sent sooner is lost or refused
        var seal = b.App.Services.GetRequiredService<ClusterSeal>();
        var commands = b.App.Services.GetRequiredService<ILvpCommandService>();

        // 1. taken at once, answered after the standby's first timeout: it waits one more timeout and shows that answer
        var first = commands.ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        var id = await ClaimNextAsync(slowLeader, requests, seal);
        await Task.Delay(timeout + TimeSpan.FromSeconds(1)); // lets the first timeout pass; not a wait for a result
        Assert.False(first.IsCompleted);
        await AnswerAsync(slowLeader, seal, new ForwardedOutcome(id, "node-slow", CommandOutcomeKind.Applied, "deterioration forecast set", 41));
        var shown = await first;
        Assert.Equal(CommandOutcomeKind.Applied, shown.Kind);
        Assert.Equal("deterioration forecast set", shown.Message);
        Assert.Equal(41, shown.AuditSequence);

        // 2. taken, answered only after both timeouts: "outcome unknown"; the answer, when it comes, is in the standby's log
        var second = commands.ExecuteAsync(s_dutyManager, new ReleaseForecast("", "TAF amended (invented)"));
        var id2 = await ClaimNextAsync(slowLeader, requests, seal);
        var unknown = await second;
        Assert.Equal(CommandOutcomeKind.Failed, unknown.Kind);
        Assert.Equal(OpsLvp.Core.Presentation.NodeWords.CommandOutcomeUnknown, unknown.Message);
        await AnswerAsync(slowLeader, seal, new ForwardedOutcome(id2, "node-slow", CommandOutcomeKind.Applied, "manual forecast setting released", 42));
        await Eventually.TrueAsync(
            () => log.Lines.Any(l => l.Level == LogLevel.Warning && l.Message.Contains(id2, StringComparison.Ordinal)
                && l.Message.Contains("manual forecast setting released", StringComparison.Ordinal) && l.Message.Contains("audit entry 42", StringComparison.Ordinal)),
            "the late outcome in the standby's log", TimeSpan.FromSeconds(30));
        // the leader's entry is the one record: the standby writes none
        Assert.DoesNotContain(await LiveClient.EntriesAsync(b.App), e => e.Actor == s_dutyManager.Name);
    }

    /// <summary>Takes the next forwarded command as a leader does (pending to claimed); its id.</summary>
    private static async Task<string> ClaimNextAsync(ConnectionMultiplexer leader, ChannelMessageQueue requests, ClusterSeal seal)
    {
        using var cts = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        var message = (string)(await requests.ReadAsync(cts.Token)).Message!;
        var id = JsonSerializer.Deserialize<ForwardedCommand>(seal.OpenCommand(message, out _)!, LiveJson.Options)!.Id;
        var claimed = (int)await leader.GetDatabase().ScriptEvaluateAsync(
            "if redis.call('GET', KEYS[1]) == 'pending' then redis.call('SET', KEYS[1], ARGV[1], 'KEEPTTL') return 1 else return 0 end",
            [new RedisKey("opslvp:command:" + id)], ["claimed:node-slow"]);
        Assert.Equal(1, claimed);
        return id;
    }

    /// <summary>Stores and publishes a sealed outcome as the leader does.</summary>
    private static async Task AnswerAsync(ConnectionMultiplexer leader, ClusterSeal seal, ForwardedOutcome outcome)
    {
        var json = seal.SealOutcome(JsonSerializer.Serialize(outcome, LiveJson.Options));
        await leader.GetDatabase().StringSetAsync("opslvp:command:" + outcome.Id, "done:" + json, keepTtl: true);
        await leader.GetSubscriber().PublishAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.OutcomesChannel), json);
    }

    /// <summary>The system clock set off by a fixed amount: a host whose time synchronisation failed. Timers run as usual.</summary>
    private sealed class OffsetClock(TimeSpan offset) : TimeProvider
    {
        public override DateTimeOffset GetUtcNow() => TimeProvider.System.GetUtcNow() + offset;
    }
}
