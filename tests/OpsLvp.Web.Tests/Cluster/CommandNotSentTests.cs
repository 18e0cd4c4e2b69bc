using System.Diagnostics;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;
using StackExchange.Redis;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// A command given on a node that does not lead, while that node cannot reach Redis, is answered at once "not applied"
/// with the reason instead of after <c>Cluster:CommandTimeout</c> (docs/deployment.md "When the command cannot be
/// sent"): two real apps (Kestrel on 127.0.0.1) on one database of a throwaway PostgreSQL cluster, which elects the
/// leader, and a throwaway redis-server the test kills, or whose default user it denies commands by ACL (a real refusal
/// by the real server: the publish, then also the withdrawal, fail as they would on a Redis that fails part-way). Names
/// and values are invented.
/// </summary>
public sealed class CommandNotSentTests
{
    private static readonly CommandCaller s_dutyManager = new("r.vale (invented)", new HashSet<string> { Roles.DutyManager }, new HashSet<string>(), true);

    /// <summary>Long, so an answer that comes from the timeout cannot be mistaken for the one at once.</summary>
    private static readonly TimeSpan s_timeout = TimeSpan.FromSeconds(60);

    private static readonly Dictionary<string, string?> s_slowTimeout = new() { ["Cluster:CommandTimeout"] = "00:01:00" };

    [PostgresRedisFact]
    public async Task RedisGoneUnderTheStandby_ACommandThereIsAnsweredNotAppliedAtOnce_AndNothingIsApplied()
    {
        await using var nodes = await PostgresNodes.CreateAsync(s_slowTimeout, redis: true);
        var (leader, standby) = await StartInTurnAsync(nodes);
        var commands = standby.Services.GetRequiredService<ILvpCommandService>();
        using var log = new CapturingLoggerProvider();
        standby.Services.GetRequiredService<ILoggerFactory>().AddProvider(log);

        // with Redis up, the standby's command is carried out by the leader: the way the next one would go
        var applied = await commands.ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        Assert.True(applied.Applied, applied.Message);
        Assert.True(leader.Services.GetRequiredService<LiveEngineHost>().State!.DeteriorationForecast);

        // this test's own redis-server is killed; the standby notices the connection is gone
        nodes.StopRedis();
        var link = standby.Services.GetRequiredService<RedisLink>();
        await Eventually.TrueAsync(() => !link.IsConnected, "the standby to lose its Redis connection", TimeSpan.FromSeconds(60));

        var clock = Stopwatch.StartNew();
        var outcome = await commands.ExecuteAsync(s_dutyManager, new ReleaseForecast("", "TAF amended (invented)"));
        clock.Stop();

        Assert.Equal(CommandOutcomeKind.Failed, outcome.Kind);
        Assert.Equal(OpsLvp.Core.Presentation.NodeWords.CommandNotSent("Redis not connected"), outcome.Message);
        Assert.StartsWith("not applied: this node cannot reach the engine node (Redis not connected)", outcome.Message, StringComparison.Ordinal);
        Assert.DoesNotContain("no engine node answered", outcome.Message, StringComparison.Ordinal);
        Assert.Null(outcome.AuditSequence);
        // at once, not after the timeout: the margin is wide (half of 60 s) for a loaded machine
        Assert.True(clock.Elapsed < s_timeout / 2, $"answered after {clock.Elapsed}, the timeout is {s_timeout}");
        // logged on the standby with the command and the reason
        Assert.Contains(log.Lines, l => l.Level == LogLevel.Error && l.Message.Contains(nameof(ReleaseForecast), StringComparison.Ordinal)
            && l.Message.Contains("not applied", StringComparison.Ordinal) && l.Message.Contains("Redis not connected", StringComparison.Ordinal));

        // nothing applied: the audit (one database for both nodes) has only the first command of the person, the
        // leader's forecast is still set, and its chain verifies
        var mine = (await LiveClient.EntriesAsync(leader)).Where(e => e.Actor == s_dutyManager.Name).ToList();
        var only = Assert.Single(mine);
        Assert.Equal(applied.AuditSequence, only.Sequence);
        Assert.True(leader.Services.GetRequiredService<LiveEngineHost>().State!.DeteriorationForecast);
        await LiveClient.AssertChainVerifiesAsync(leader);
    }

    [PostgresRedisFact]
    public async Task APublishRedisRefuses_IsWithdrawnAndAnsweredNotApplied_OrOutcomeUnknownWhenTheWithdrawalFailsToo()
    {
        await using var nodes = await PostgresNodes.CreateAsync(s_slowTimeout, redis: true);
        var (leader, standby) = await StartInTurnAsync(nodes);
        var commands = standby.Services.GetRequiredService<ILvpCommandService>();
        var redis = nodes.Redis!;
        await using var observer = await ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        using var log = new CapturingLoggerProvider();
        standby.Services.GetRequiredService<ILoggerFactory>().AddProvider(log);

        // 1. Redis refuses PUBLISH: the key was written, the command not sent; withdrawn (pending to expired), so "not applied" is certain
        Assert.Equal("+OK", await redis.CommandAsync("ACL SETUSER default -publish"));
        var clock = Stopwatch.StartNew();
        var notSent = await commands.ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        clock.Stop();
        Assert.Equal(CommandOutcomeKind.Failed, notSent.Kind);
        Assert.StartsWith("not applied: this node cannot reach the engine node (Redis error: NOPERM", notSent.Message, StringComparison.Ordinal);
        Assert.EndsWith("the command was not carried out. Try again shortly, or from a screen on another node", notSent.Message, StringComparison.Ordinal);
        Assert.Null(notSent.AuditSequence);
        Assert.True(clock.Elapsed < s_timeout / 2, $"answered after {clock.Elapsed}, the timeout is {s_timeout}");
        Assert.Equal(["expired"], await CommandKeyValuesAsync(observer));

        // 2. Redis refuses the withdrawal too: the command may have gone out, so the person is told the outcome is unknown
        Assert.Equal("+OK", await redis.CommandAsync("ACL SETUSER default -eval -evalsha"));
        clock.Restart();
        var unknown = await commands.ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        clock.Stop();
        Assert.Equal(CommandOutcomeKind.Failed, unknown.Kind);
        Assert.StartsWith("outcome unknown: the link to the engine node failed while the command was being sent (Redis error: NOPERM", unknown.Message, StringComparison.Ordinal);
        Assert.EndsWith("check the audit log or the screen before repeating it", unknown.Message, StringComparison.Ordinal);
        Assert.True(clock.Elapsed < s_timeout / 2, $"answered after {clock.Elapsed}, the timeout is {s_timeout}");
        Assert.Equal(["expired", "pending"], await CommandKeyValuesAsync(observer));
        Assert.Contains(log.Lines, l => l.Level == LogLevel.Error && l.Message.Contains("could not be withdrawn", StringComparison.Ordinal));

        // neither was carried out: no audit entry of the person, no forecast set on the leader
        Assert.DoesNotContain(await LiveClient.EntriesAsync(leader), e => e.Actor == s_dutyManager.Name);
        Assert.False(leader.Services.GetRequiredService<LiveEngineHost>().State!.DeteriorationForecast);

        // Redis accepts everything again: the next command goes through as usual
        Assert.Equal("+OK", await redis.CommandAsync("ACL SETUSER default +@all"));
        var applied = await commands.ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        Assert.True(applied.Applied, applied.Message);
        var entry = Assert.Single(await LiveClient.EntriesAsync(leader), e => e.Actor == s_dutyManager.Name);
        Assert.Equal(applied.AuditSequence, entry.Sequence);
    }

    /// <summary>
    /// node-a, then, once it leads, node-b: the first creates the installation's key ring and the second finds it. Returns
    /// once both listen on the command channel, so the first command meets a connected standby.
    /// </summary>
    private static async Task<(OpsLvpApp Leader, OpsLvpApp Standby)> StartInTurnAsync(PostgresNodes nodes)
    {
        var first = nodes.Start("node-a");
        await Eventually.TrueAsync(() => first.Services.GetRequiredService<ILeadership>().IsLeader, "node-a to lead", TimeSpan.FromSeconds(60));
        var pair = await PostgresNodes.LeaderAndStandbyAsync(first, nodes.Start("node-b"));
        await CommandChannel.WaitForSubscribersAsync(nodes.Redis!.Configuration, 2);
        return pair;
    }

    /// <summary>The values of every forwarded command's key (<c>pending</c>, <c>expired</c>, ...), sorted.</summary>
    private static async Task<List<string>> CommandKeyValuesAsync(ConnectionMultiplexer observer)
    {
        var db = observer.GetDatabase();
        var keys = (RedisResult[])(await db.ExecuteAsync("KEYS", "opslvp:command:*"))!;
        var values = new List<string>();
        foreach (var key in keys)
        {
            values.Add((string?)await db.StringGetAsync((string)key!) ?? "(gone)");
        }
        values.Sort(StringComparer.Ordinal);
        return values;
    }
}
