using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;
using StackExchange.Redis;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// Commands published straight on Redis by someone who is not a node of this installation (docs/engine.md R76–R77,
/// docs/access.md "Commands between nodes"): unsealed, sealed with another key ring, changed in transit, replayed after
/// being carried out, and replayed after the time a command may take. Real apps on Kestrel, a real redis-server; the
/// leader carries none of them out, counts and logs each refusal, and still carries out a genuine command afterwards.
/// Names are invented.
/// </summary>
public sealed class ForgedCommandTests
{
    private static readonly CommandCaller s_dutyManager = new("r.vale (invented)", new HashSet<string> { Roles.DutyManager }, new HashSet<string>(), true);
    private const string Intruder = "x.intruder (invented)";

    [RedisFact]
    public async Task AnUnsealedCommand_AndOneSealedByAnotherInstallation_AreNotCarriedOut()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        await using var other = ClusterNode.Start("node-other", redis.Configuration, leader: false, ownKeyRing: true);
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 3); // every node (and listener) subscribed: a command sent sooner is lost or refused
        await LiveClient.WaitForPhaseAsync(a.App, "normal", TimeSpan.FromSeconds(60));
        await using var attacker = await ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        var forwarding = a.App.Services.GetRequiredService<CommandForwarding>();

        // the message a node sent before commands were sealed: plain JSON naming a duty manager
        var plainId = Guid.NewGuid().ToString("N");
        var plain = JsonSerializer.Serialize(ForwardedCommand.From(plainId, "node-b", Caller(Intruder), new SetForecast("", true, "forged (invented)"), DateTimeOffset.UtcNow), LiveJson.Options);
        await PublishAsync(attacker, plainId, plain);
        await Eventually.TrueAsync(() => forwarding.Refusals >= 1, "the unsealed command refused", TimeSpan.FromSeconds(30));
        Assert.Contains("not sealed by a node of this installation", forwarding.LastRefusal, StringComparison.Ordinal);

        // sealed, but with a key ring that is not this installation's
        var otherId = Guid.NewGuid().ToString("N");
        var sealedElsewhere = other.App.Services.GetRequiredService<ClusterSeal>().SealCommand(
            JsonSerializer.Serialize(ForwardedCommand.From(otherId, "node-other", Caller(Intruder), new SetForecast("", true, "forged (invented)"), DateTimeOffset.UtcNow), LiveJson.Options));
        await PublishAsync(attacker, otherId, sealedElsewhere);
        await Eventually.TrueAsync(() => forwarding.Refusals >= 2, "the command sealed elsewhere refused", TimeSpan.FromSeconds(30));
        Assert.Contains("not sealed by a node of this installation", forwarding.LastRefusal, StringComparison.Ordinal);

        // the channel keeps working: a genuine command from B is carried out after them (one at a time, in order)
        var genuine = await b.App.Services.GetRequiredService<ILvpCommandService>().ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        Assert.True(genuine.Applied, genuine.Message);
        var entries = await LiveClient.EntriesAsync(a.App);
        Assert.DoesNotContain(entries, e => e.Actor == Intruder);
        Assert.Single(entries, e => e.Actor == s_dutyManager.Name);
        var db = attacker.GetDatabase();
        Assert.Equal("pending", (string?)await db.StringGetAsync("opslvp:command:" + plainId)); // never claimed
        Assert.Equal("pending", (string?)await db.StringGetAsync("opslvp:command:" + otherId));
        Assert.Equal(2, forwarding.Refusals);
    }

    [RedisFact]
    public async Task AGenuineCommandChangedInTransit_OrReplayedAfterItWasCarriedOut_IsNotCarriedOutAgain()
    {
        using var redis = await RedisServerProcess.StartAsync();
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: true);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false);
        await LiveClient.WaitForPhaseAsync(a.App, "normal", TimeSpan.FromSeconds(60));
        await using var attacker = await ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        var captured = await attacker.GetSubscriber().SubscribeAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel));
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 3); // every node (and listener) subscribed: a command sent sooner is lost or refused
        var forwarding = a.App.Services.GetRequiredService<CommandForwarding>();

        var outcome = await b.App.Services.GetRequiredService<ILvpCommandService>().ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        Assert.True(outcome.Applied, outcome.Message);
        using var cts = new CancellationTokenSource(TimeSpan.FromSeconds(30));
        var message = (string)(await captured.ReadAsync(cts.Token)).Message!;
        Assert.DoesNotContain(s_dutyManager.Name, message, StringComparison.Ordinal); // sealed: not readable on Redis either
        var key = Assert.Single(((RedisResult[])(await attacker.GetDatabase().ExecuteAsync("KEYS", "opslvp:command:*"))!).Select(k => (string)k!));
        Assert.StartsWith("done:", (string?)await attacker.GetDatabase().StringGetAsync(key), StringComparison.Ordinal);

        // changed in transit: one character of the sealed text altered, the key set back to pending
        var middle = message.Length / 2;
        var tampered = message[..middle] + (message[middle] == 'A' ? 'B' : 'A') + message[(middle + 1)..];
        await attacker.GetDatabase().StringSetAsync(key, "pending");
        await attacker.GetSubscriber().PublishAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel), tampered);
        await Eventually.TrueAsync(() => forwarding.Refusals >= 1, "the tampered command refused", TimeSpan.FromSeconds(30));
        Assert.Contains("not sealed by a node of this installation", forwarding.LastRefusal, StringComparison.Ordinal);

        // replayed as captured, its key set back to pending so the claim script alone would let it through
        await attacker.GetSubscriber().PublishAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel), message);
        await Eventually.TrueAsync(() => forwarding.Refusals >= 2, "the replayed command refused", TimeSpan.FromSeconds(30));
        Assert.Contains("a replay", forwarding.LastRefusal, StringComparison.Ordinal);

        Assert.Equal("pending", (string?)await attacker.GetDatabase().StringGetAsync(key));
        Assert.Single(await LiveClient.EntriesAsync(a.App), e => e.Actor == s_dutyManager.Name);
    }

    [RedisFact]
    public async Task ACapturedCommand_ReplayedLaterToANewLeader_IsRefusedAsTooOld()
    {
        using var redis = await RedisServerProcess.StartAsync();
        var fast = new Dictionary<string, string?> { ["Cluster:CommandTimeout"] = "00:00:01" };
        await using var a = ClusterNode.Start("node-a", redis.Configuration, leader: false, settings: fast);
        await using var b = ClusterNode.Start("node-b", redis.Configuration, leader: false, settings: fast);
        await using var attacker = await ConnectionMultiplexer.ConnectAsync(redis.Configuration);
        var captured = await attacker.GetSubscriber().SubscribeAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel));
        await CommandChannel.WaitForSubscribersAsync(redis.Configuration, 3); // every node (and listener) subscribed: a command sent sooner is lost or refused

        // no leader: the command is withdrawn after the timeout, and captured on the way
        var outcome = await b.App.Services.GetRequiredService<ILvpCommandService>().ExecuteAsync(s_dutyManager, new SetForecast("", true, "TAF shows fog (invented)"));
        Assert.Equal(CommandOutcomeKind.Failed, outcome.Kind);
        using var cts = new CancellationTokenSource(TimeSpan.FromSeconds(30));
        var message = (string)(await captured.ReadAsync(cts.Token)).Message!;
        var key = Assert.Single(((RedisResult[])(await attacker.GetDatabase().ExecuteAsync("KEYS", "opslvp:command:*"))!).Select(k => (string)k!));

        // later (past the timeout and the clock allowance), A leads; the attacker deletes the key's trace (as a restarted
        // Redis without persistence would), sets it pending and replays the genuine sealed message
        a.Leadership.Set(true, epoch: 2);
        await LiveClient.WaitForPhaseAsync(a.App, "normal", TimeSpan.FromSeconds(60));
        var forwarding = a.App.Services.GetRequiredService<CommandForwarding>();
        var window = TimeSpan.FromSeconds(1) + CommandForwarding.MaxClockSkew;
        await Task.Delay(window + TimeSpan.FromSeconds(1)); // let the message age past the window, not a wait for a result
        await attacker.GetDatabase().StringSetAsync(key, "pending");
        await attacker.GetSubscriber().PublishAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel), message);

        await Eventually.TrueAsync(() => forwarding.Refusals >= 1, "the old command refused", TimeSpan.FromSeconds(30));
        Assert.Contains("too old", forwarding.LastRefusal, StringComparison.Ordinal);
        // never claimed; its key found pending, it gets the one sealed answer a genuine command refused for its time gets
        // (docs/engine.md R85), which the attacker cannot read
        // (the answer is written after the refusal is counted: wait for it rather than read it at once)
        var answerBy = DateTime.UtcNow.AddSeconds(30);
        var stored = (string?)await attacker.GetDatabase().StringGetAsync(key);
        while (stored?.StartsWith("done:", StringComparison.Ordinal) != true && DateTime.UtcNow < answerBy)
        {
            await Task.Delay(50);
            stored = await attacker.GetDatabase().StringGetAsync(key);
        }
        Assert.StartsWith("done:", stored, StringComparison.Ordinal);
        Assert.Equal(CommandOutcomeKind.Refused, JsonSerializer.Deserialize<ForwardedOutcome>(a.App.Services.GetRequiredService<ClusterSeal>().OpenOutcome(stored!["done:".Length..], out _)!, LiveJson.Options)!.Kind);
        Assert.DoesNotContain(await LiveClient.EntriesAsync(a.App), e => e.Actor == s_dutyManager.Name);
    }

    private static CommandCaller Caller(string name) => new(name, new HashSet<string> { Roles.DutyManager }, new HashSet<string>(), true);

    private static async Task PublishAsync(ConnectionMultiplexer attacker, string id, string body)
    {
        // what any client of the Redis can do: the pending key the claim script wants, then the message
        await attacker.GetDatabase().StringSetAsync("opslvp:command:" + id, "pending", TimeSpan.FromHours(1));
        await attacker.GetSubscriber().PublishAsync(RedisChannel.Literal("opslvp:" + CommandForwarding.CommandsChannel), body);
    }
}
