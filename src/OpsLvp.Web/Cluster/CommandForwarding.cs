using System.Collections.Concurrent;
using System.Text.Json;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;
using StackExchange.Redis;

using OpsLvp.Web.Time;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// Commands between nodes over Redis (docs/deployment.md "Fan-out and commands between nodes"). A node that does not
/// lead writes the key <c>&lt;prefix&gt;:command:&lt;id&gt;</c> = <c>pending</c> and publishes the command on
/// <c>&lt;prefix&gt;:commands</c>. The leader takes it only by turning <c>pending</c> into <c>claimed</c> (one atomic
/// script), carries it out through <see cref="LvpCommandService"/> (same checks, audit and outcome as its own pages),
/// stores the outcome in the key and publishes it on <c>&lt;prefix&gt;:outcomes</c>. When no outcome arrives within
/// <see cref="FanoutOptions.CommandTimeout"/> the sender turns <c>pending</c> into <c>expired</c> with the same kind of
/// script: whichever of the two comes first wins, so a command the person was told "not applied" can never be
/// carried out later, by this leader or one that appears afterwards.
/// <para>Both directions are sealed (<see cref="ClusterSeal"/>, docs/engine.md R76–R77): the leader carries out only a
/// command a node of this installation sealed, sent within <see cref="FanoutOptions.CommandTimeout"/> plus
/// <see cref="MaxClockSkew"/> of its own clock, and whose id it has not seen yet; anything else is refused, logged with
/// its reason and counted (<see cref="Refusals"/>, shown by <c>/health</c>), and the channel keeps running.</para>
/// <para>What the person on the sending node is told (R85): a genuine, new command refused only for its send time (the
/// nodes' clocks differ) and any failure while the leader carries out a command it took are answered, sealed, with the
/// reason, instead of being left to the timeout; replays and messages that do not open are never answered. An outcome
/// that arrives after the person was told it is unknown is logged on the sending node.</para>
/// <para>A command this node cannot send (Redis not connected, the write or the publish failing, or the publish reaching
/// no subscriber) is answered at once: "not applied" when nothing was published or the command was withdrawn
/// (<c>pending</c> to <c>expired</c>) before any engine node took it, "outcome unknown" when the publish failed and the
/// withdrawal failed too, so it may have reached the engine node (docs/engine.md R85 (d), docs/deployment.md "When the
/// command cannot be sent").</para>
/// </summary>
public sealed class CommandForwarding(
    RedisLink redis,
    LvpCommandService local,
    ClusterSeal seal,
    ILeadership leadership,
    IOptions<FanoutOptions> options,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
    ILogger<CommandForwarding> logger) : BackgroundService
{
    public const string CommandsChannel = "commands";
    public const string OutcomesChannel = "outcomes";

    private const string Pending = "pending";
    private const string Expired = "expired";
    private const string ClaimedPrefix = "claimed:";
    private const string DonePrefix = "done:";

    // KEYS[1] = the command's key; ARGV[1] = the new value. Changes it only while it is still pending.
    private const string FromPendingScript =
        "if redis.call('GET', KEYS[1]) == 'pending' then redis.call('SET', KEYS[1], ARGV[1], 'KEEPTTL') return 1 else return 0 end";

    // Kept for an hour: long after any command could still be in flight.
    private static readonly TimeSpan s_keyLifetime = TimeSpan.FromHours(1);
    private static readonly TimeSpan s_pollInterval = TimeSpan.FromMilliseconds(200);

    /// <summary>How far apart the nodes' clocks may be: a command's send time may be this far ahead of the leader's clock, or this much older than the timeout allows.</summary>
    public static readonly TimeSpan MaxClockSkew = TimeSpan.FromSeconds(5);

    private readonly FanoutOptions _options = options.Value;
    private readonly ConcurrentDictionary<string, TaskCompletionSource<ForwardedOutcome>> _waiting = new(StringComparer.Ordinal);

    // ids this node has taken or refused while leading, with their send time: a sealed message delivered again is refused
    // even if someone with access to Redis has set its key back to pending
    private readonly ConcurrentDictionary<string, DateTimeOffset> _seen = new(StringComparer.Ordinal);
    // ids of commands whose person this node told "outcome unknown", with what and who: an outcome that still comes is logged (R85)
    private readonly ConcurrentDictionary<string, (string Command, string Actor, DateTimeOffset At)> _unknown = new(StringComparer.Ordinal);
    private long _refused;
    private volatile string? _lastRefusal;

    /// <summary>Forwarded commands refused since start as not sealed by this installation, stale, replayed or malformed (docs/engine.md R77).</summary>
    public long Refusals => Interlocked.Read(ref _refused);

    /// <summary>Why the last one was refused, or null.</summary>
    public string? LastRefusal => _lastRefusal;

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        if (!redis.Enabled)
        {
            return;
        }
        ChannelMessageQueue? outcomes = null;
        ChannelMessageQueue? commands = null;
        try
        {
            var connection = await redis.Connection.WaitAsync(stoppingToken);
            var subscriber = connection.GetSubscriber();
            outcomes = await subscriber.SubscribeAsync(redis.Channel(OutcomesChannel));
            outcomes.OnMessage(message => ReceiveOutcome(message.Message));
            commands = await subscriber.SubscribeAsync(redis.Channel(CommandsChannel));
            // in order, one at a time, as the leader's own pages' commands are
            commands.OnMessage(message => CarryOutAsync(connection, message.Message, stoppingToken));
            await Task.Delay(Timeout.Infinite, stoppingToken);
        }
        catch (OperationCanceledException)
        {
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException)
        {
            logger.LogError(ex, "Cluster:Redis: the command channels could not be subscribed; commands are not forwarded");
        }
        finally
        {
            if (commands is not null)
            {
                await commands.UnsubscribeAsync();
            }
            if (outcomes is not null)
            {
                await outcomes.UnsubscribeAsync();
            }
        }
    }

    /// <summary>Whether <c>Cluster:Redis</c> is set (commands can be forwarded).</summary>
    public bool Enabled => redis.Enabled;

    /// <summary>
    /// Sends <paramref name="command"/> to the leader and returns its outcome, or "not applied" after the timeout; at once
    /// when it cannot be sent ("not applied" where that is certain, else "outcome unknown").
    /// </summary>
    public async Task<CommandOutcome> ForwardAsync(CommandCaller caller, EngineCommand command, CancellationToken cancellationToken)
    {
        var id = Guid.NewGuid().ToString("N");
        var key = redis.Key("command:" + id);
        var reply = new TaskCompletionSource<ForwardedOutcome>(TaskCreationOptions.RunContinuationsAsynchronously);
        _waiting[id] = reply;
        try
        {
            // A failure to send is answered at once, never left to the timeout; "not applied" only where that is certain
            // (docs/deployment.md "When the command cannot be sent").
            if (!redis.Connection.IsCompletedSuccessfully)
            {
                return NotSent(command, caller, id, "Redis not connected yet", null);
            }
            var connection = await redis.Connection;
            if (!connection.IsConnected)
            {
                return NotSent(command, caller, id, "Redis not connected", null); // nothing was sent
            }
            var db = connection.GetDatabase();
            var body = seal.SealCommand(JsonSerializer.Serialize(ForwardedCommand.From(id, leadership.NodeId, caller, command, realClock.GetUtcNow()), LiveJson.Options));
            try
            {
                if (!await db.StringSetAsync(key, Pending, s_keyLifetime, When.NotExists))
                {
                    return new CommandOutcome(CommandOutcomeKind.Failed, NodeWords.CommandNotApplied(TimeSpan.Zero));
                }
            }
            catch (Exception ex) when (ex is RedisException or TimeoutException)
            {
                // the command itself was never published: even if the key was written, no engine node can carry it out
                return NotSent(command, caller, id, Short(ex), ex);
            }
            long receivers;
            try
            {
                receivers = await connection.GetSubscriber().PublishAsync(redis.Channel(CommandsChannel), body);
            }
            catch (Exception ex) when (ex is RedisException or TimeoutException)
            {
                // it may still have reached Redis and the engine node: only a successful withdrawal makes "not applied" certain
                logger.LogWarning(ex, "Command {Command} by {Actor} ({Id}): sending it to the engine node failed; withdrawing it", command.GetType().Name, caller.Name, id);
                if (await WithdrawUnsentAsync(db, key, id, command, caller, Short(ex)) is { } answer)
                {
                    return answer;
                }
                receivers = -1;
            }
            if (receivers == 0)
            {
                // no subscriber received it (not even this node's own): withdrawn unless some engine node took it after all
                logger.LogWarning("Command {Command} by {Actor} ({Id}): no node received it on Cluster:Redis; withdrawing it", command.GetType().Name, caller.Name, id);
                if (await WithdrawUnsentAsync(db, key, id, command, caller, "no node received it") is { } answer)
                {
                    return answer;
                }
            }
            if (await WaitAsync(reply.Task, _options.CommandTimeout, realClock, cancellationToken) is { } outcome)
            {
                return outcome.ToOutcome();
            }
            return await SettleAsync(db, key, id, command, caller, reply.Task);
        }
        finally
        {
            _waiting.TryRemove(id, out _);
        }
    }

    /// <summary>After the timeout: withdraw the command if the leader has not taken it; else wait once more for its outcome.</summary>
    private async Task<CommandOutcome> SettleAsync(IDatabase db, RedisKey key, string id, EngineCommand command, CommandCaller caller, Task<ForwardedOutcome> reply)
    {
        try
        {
            // not cancellable: once the wait is over, the command must be settled one way or the other
            if ((int)await db.ScriptEvaluateAsync(FromPendingScript, [key], [Expired]) == 1)
            {
                logger.LogWarning("Command {Command} by {Actor} ({Id}) withdrawn: no engine node took it within {Timeout}", command.GetType().Name, caller.Name, id, _options.CommandTimeout);
                return new CommandOutcome(CommandOutcomeKind.Failed, NodeWords.CommandNotApplied(_options.CommandTimeout));
            }
            var deadline = realClock.GetUtcNow() + _options.CommandTimeout;
            while (true)
            {
                if (reply.IsCompletedSuccessfully)
                {
                    return reply.Result.ToOutcome();
                }
                var value = (string?)await db.StringGetAsync(key);
                if (value is not null && value.StartsWith(DonePrefix, StringComparison.Ordinal))
                {
                    if (seal.OpenOutcome(value[DonePrefix.Length..], out var why) is { } json)
                    {
                        return JsonSerializer.Deserialize<ForwardedOutcome>(json, LiveJson.Options)!.ToOutcome();
                    }
                    logger.LogError("Command {Id}: the outcome stored for it was refused: {Reason}", id, why);
                    break;
                }
                if (value is null || value == Expired || realClock.GetUtcNow() >= deadline)
                {
                    break;
                }
                await Task.Delay(s_pollInterval, realClock, CancellationToken.None);
            }
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException or JsonException)
        {
            logger.LogError(ex, "Command {Id}: its outcome could not be read", id);
        }
        logger.LogError("Command {Command} by {Actor} ({Id}) was taken by the engine node but no outcome came back", command.GetType().Name, caller.Name, id);
        RememberUnknown(id, command, caller);
        return new CommandOutcome(CommandOutcomeKind.Failed, NodeWords.CommandOutcomeUnknown);
    }

    /// <summary>"Not applied" at once, for a command this node could not send: nothing an engine node could carry out was published.</summary>
    private CommandOutcome NotSent(EngineCommand command, CommandCaller caller, string id, string why, Exception? ex)
    {
        logger.LogError(ex, "Command {Command} by {Actor} ({Id}) not applied: it could not be sent to the engine node over Cluster:Redis ({Reason})", command.GetType().Name, caller.Name, id, why);
        return new CommandOutcome(CommandOutcomeKind.Failed, NodeWords.CommandNotSent(why));
    }

    /// <summary>
    /// After a send that failed or reached nobody: turns the key from <c>pending</c> into <c>expired</c>. Done: no engine node
    /// can take it any more, so "not applied" is certain. Not done because an engine node took it: null, and the caller
    /// waits for its outcome as usual. The withdrawal failing as well: the outcome is unknown.
    /// </summary>
    private async Task<CommandOutcome?> WithdrawUnsentAsync(IDatabase db, RedisKey key, string id, EngineCommand command, CommandCaller caller, string why)
    {
        try
        {
            if ((int)await db.ScriptEvaluateAsync(FromPendingScript, [key], [Expired]) == 1)
            {
                return NotSent(command, caller, id, why, null);
            }
            logger.LogWarning("Command {Command} by {Actor} ({Id}): an engine node took it although sending it reported a failure ({Reason}); waiting for its outcome", command.GetType().Name, caller.Name, id, why);
            return null;
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException)
        {
            logger.LogError(ex, "Command {Command} by {Actor} ({Id}): sending it failed ({Reason}) and it could not be withdrawn: outcome unknown", command.GetType().Name, caller.Name, id, why);
            RememberUnknown(id, command, caller);
            return new CommandOutcome(CommandOutcomeKind.Failed, NodeWords.CommandSendUnknown(why));
        }
    }

    /// <summary>Why Redis failed, in a few words for the person (the log has the whole exception).</summary>
    private static string Short(Exception ex) => ex switch
    {
        RedisConnectionException => "Redis not connected",
        TimeoutException => "Redis did not answer in time",
        _ => "Redis error: " + (ex.Message.Length > 120 ? ex.Message[..120] + "…" : ex.Message).ReplaceLineEndings(" "),
    };

    private void RememberUnknown(string id, EngineCommand command, CommandCaller caller)
    {
        var now = realClock.GetUtcNow();
        foreach (var (oldId, old) in _unknown)
        {
            if (now - old.At > s_keyLifetime)
            {
                _unknown.TryRemove(oldId, out _);
            }
        }
        _unknown[id] = (command.GetType().Name, caller.Name, now);
    }

    private static async Task<ForwardedOutcome?> WaitAsync(Task<ForwardedOutcome> reply, TimeSpan timeout, TimeProvider clock, CancellationToken cancellationToken)
    {
        try
        {
            return await reply.WaitAsync(timeout, clock, cancellationToken);
        }
        catch (TimeoutException)
        {
            return null;
        }
        catch (OperationCanceledException)
        {
            return null; // the person left; the command is still settled so it cannot be applied later unseen
        }
    }

    private void ReceiveOutcome(RedisValue value)
    {
        if (value.IsNullOrEmpty)
        {
            return;
        }
        if (seal.OpenOutcome((string)value!, out var why) is not { } json)
        {
            logger.LogError("Refused an outcome message on Cluster:Redis: {Reason}", why);
            return;
        }
        try
        {
            if (JsonSerializer.Deserialize<ForwardedOutcome>(json, LiveJson.Options) is not { } outcome)
            {
                return;
            }
            if (_waiting.TryGetValue(outcome.Id, out var waiting))
            {
                waiting.TrySetResult(outcome);
            }
            else if (_unknown.TryRemove(outcome.Id, out var gaveUp))
            {
                // too late for the person, who was told to check the audit log: the log says what it will show
                logger.LogWarning("Command {Command} by {Actor} ({Id}): the outcome from the engine node {Node} came after the person was told it is unknown: {Kind}: {Message} (audit entry {Sequence})",
                    gaveUp.Command, gaveUp.Actor, outcome.Id, outcome.Node, outcome.Kind, outcome.Message, outcome.AuditSequence?.ToString(System.Globalization.CultureInfo.InvariantCulture) ?? "none");
            }
        }
        catch (JsonException ex)
        {
            logger.LogWarning(ex, "Ignored an outcome message that is not one");
        }
    }

    private async Task CarryOutAsync(IConnectionMultiplexer connection, RedisValue value, CancellationToken stoppingToken)
    {
        if (!leadership.IsLeader)
        {
            return;
        }
        ForwardedCommand? request = null;
        try
        {
            request = Admit(value, out var refusal);
            if (request is null)
            {
                if (refusal is { } answer)
                {
                    await AnswerRefusalAsync(connection, answer.Command, answer.Message);
                }
                return;
            }
            var db = connection.GetDatabase();
            var key = redis.Key("command:" + request.Id);
            if ((int)await db.ScriptEvaluateAsync(FromPendingScript, [key], [ClaimedPrefix + leadership.NodeId]) != 1)
            {
                logger.LogInformation("Forwarded command {Id} from {Node} not carried out: withdrawn or taken already", request.Id, request.FromNode);
                return;
            }
            var outcome = await ExecuteClaimedAsync(request, stoppingToken);
            var json = SealAnswer(request, outcome);
            await db.ScriptEvaluateAsync("redis.call('SET', KEYS[1], ARGV[1], 'KEEPTTL') return 1", [key], [DonePrefix + json]);
            await connection.GetSubscriber().PublishAsync(redis.Channel(OutcomesChannel), json);
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
            logger.LogWarning("Forwarded command {Id} ({Type}) from {Node}: this node stopped while carrying it out", request?.Id, request?.Type, request?.FromNode);
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException)
        {
            logger.LogError(ex, "Forwarded command {Id} ({Type}) from {Node}: Cluster:Redis failed while carrying it out", request?.Id, request?.Type, request?.FromNode);
        }
        catch (Exception ex)
        {
            // sealing or storing the answer failed: the sender waits for the outcome stored in the key, then says it is unknown
            logger.LogError(ex, "Forwarded command {Id} ({Type}) from {Node}: its outcome could not be sent", request?.Id, request?.Type, request?.FromNode);
        }
    }

    /// <summary>
    /// Carries out a claimed command. Any failure is answered, never left to the sender's timeout: a command that could not
    /// be read here is "not applied" (it never reached the engine); one whose evaluation threw may or may not have been
    /// recorded, so the person is told to check the audit log (docs/engine.md R85).
    /// </summary>
    private async Task<CommandOutcome> ExecuteClaimedAsync(ForwardedCommand request, CancellationToken stoppingToken)
    {
        CommandCaller caller;
        EngineCommand? command;
        try
        {
            caller = request.ToCaller();
            command = request.ToCommand();
        }
        catch (JsonException ex)
        {
            logger.LogWarning("Forwarded command {Id} ({Type}) from {Node} by {Actor} refused: its fields are not valid ({Error})", request.Id, request.Type, request.FromNode, request.Caller, ex.Message);
            return new CommandOutcome(CommandOutcomeKind.Refused, $"not applied: the command's fields are not valid ({ex.Message})");
        }
        catch (Exception ex)
        {
            logger.LogError(ex, "Forwarded command {Id} ({Type}) from {Node} by {Actor} could not be read on this engine node; not applied", request.Id, request.Type, request.FromNode, request.Caller);
            return new CommandOutcome(CommandOutcomeKind.Failed, $"not applied: the engine node {leadership.NodeId} could not read the command ({Describe(ex)})");
        }
        if (command is null)
        {
            return new CommandOutcome(CommandOutcomeKind.Refused, $"not applied: unknown command {request.Type}");
        }
        try
        {
            return await local.ExecuteAsync(caller, command, stoppingToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException || !stoppingToken.IsCancellationRequested)
        {
            logger.LogError(ex, "Forwarded command {Id} ({Type}) from {Node} by {Actor} failed on this engine node", request.Id, request.Type, request.FromNode, request.Caller);
            return new CommandOutcome(CommandOutcomeKind.Failed, NodeWords.CommandFailedOnEngineNode(leadership.NodeId, Describe(ex)));
        }
    }

    private static string Describe(Exception ex) => $"{ex.GetType().Name}: {ex.Message.ReplaceLineEndings(" ")}";

    private string SealAnswer(ForwardedCommand request, CommandOutcome outcome) =>
        seal.SealOutcome(JsonSerializer.Serialize(new ForwardedOutcome(request.Id, leadership.NodeId, outcome.Kind, outcome.Message, outcome.AuditSequence), LiveJson.Options));

    /// <summary>
    /// Answers a genuine command refused for its send time (R85): stored in its key only while that is still
    /// <c>pending</c> (the sender still waits), then published. A key already withdrawn, expired or carried out gets no answer.
    /// </summary>
    private async Task AnswerRefusalAsync(IConnectionMultiplexer connection, ForwardedCommand request, string message)
    {
        var json = SealAnswer(request, new CommandOutcome(CommandOutcomeKind.Refused, message));
        var key = redis.Key("command:" + request.Id);
        if ((int)await connection.GetDatabase().ScriptEvaluateAsync(FromPendingScript, [key], [DonePrefix + json]) != 1)
        {
            logger.LogInformation("Refused forwarded command {Id} from {Node} not answered: nobody waits for it any more", request.Id, request.FromNode);
            return;
        }
        await connection.GetSubscriber().PublishAsync(redis.Channel(OutcomesChannel), json);
    }

    /// <summary>
    /// The command in <paramref name="value"/> if this leader may carry it out: sealed by a node of this installation
    /// (R76), sent recently by its own clock and not seen before (R77). Otherwise null, with the refusal logged and counted;
    /// <paramref name="answer"/> is then the refusal to send back when the command is genuine, new and refused only for its
    /// send time (R85): the nodes' clocks differ, which the person on the sending node must be told. Nothing else is answered.
    /// </summary>
    internal ForwardedCommand? Admit(RedisValue value, out (ForwardedCommand Command, string Message)? answer)
    {
        answer = null;
        if (value.IsNullOrEmpty)
        {
            return Refuse("an empty message");
        }
        if (seal.OpenCommand((string)value!, out var why) is not { } json)
        {
            return Refuse(why!);
        }
        ForwardedCommand? request;
        try
        {
            request = JsonSerializer.Deserialize<ForwardedCommand>(json, LiveJson.Options);
        }
        catch (JsonException ex)
        {
            return Refuse($"sealed, but not a command ({ex.Message})");
        }
        if (request is null || string.IsNullOrEmpty(request.Id) || request.Id.Length > 64 || !request.Id.All(char.IsAsciiLetterOrDigit))
        {
            return Refuse("sealed, but without a valid id");
        }
        var now = realClock.GetUtcNow();
        var oldest = now - _options.CommandTimeout - MaxClockSkew;
        foreach (var (seenId, since) in _seen)
        {
            if (since < oldest)
            {
                _seen.TryRemove(seenId, out _);
            }
        }
        var tooOld = request.SentAt < oldest;
        var ahead = request.SentAt > now + MaxClockSkew;
        // one answer per id: a refused one is remembered from now (its own time is off), a taken one by its send time
        if (!_seen.TryAdd(request.Id, tooOld || ahead ? now : request.SentAt))
        {
            return Refuse($"command {request.Id} from {request.FromNode} by {request.Caller} was delivered before: a replay");
        }
        if (tooOld)
        {
            var age = (now - request.SentAt).TotalSeconds;
            answer = (request, $"not applied: the engine node {leadership.NodeId} received this command {age:0} s after {request.FromNode} sent it by {request.FromNode}'s clock, more than the {(_options.CommandTimeout + MaxClockSkew).TotalSeconds:0} s allowed: the clocks of {request.FromNode} and {leadership.NodeId} differ (check their time synchronisation) or the message was held up on the way");
            return Refuse($"command {request.Id} from {request.FromNode} by {request.Caller} was sent at {request.SentAt:O}, {age:0.#} s ago: too old to be carried out (a delayed or replayed message, or {request.FromNode}'s clock is behind)");
        }
        if (ahead)
        {
            var by = (request.SentAt - now).TotalSeconds;
            answer = (request, $"not applied: the clock of {request.FromNode} is {by:0} s ahead of the engine node {leadership.NodeId}'s (at most {MaxClockSkew.TotalSeconds:0} s is allowed); check their time synchronisation");
            return Refuse($"command {request.Id} from {request.FromNode} by {request.Caller} claims to be sent at {request.SentAt:O}, ahead of this node's clock {now:O}");
        }
        return request;
    }

    private ForwardedCommand? Refuse(string reason)
    {
        // the reason first: whoever sees the count (health, a test) then sees this refusal's reason, not the one before
        _lastRefusal = reason;
        Interlocked.Increment(ref _refused);
        logger.LogError("Refused a forwarded command on Cluster:Redis, not carried out: {Reason}", reason);
        return null;
    }
}
