using System.Text.Json;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Live;
using StackExchange.Redis;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// Snapshot fan-out over Redis (docs/deployment.md "Fan-out and commands between nodes"). While this node leads it
/// publishes every snapshot its engine makes current on channel <c>&lt;prefix&gt;:snapshots</c>: on the publishing
/// thread, before the node's own hub clients are sent it, when no publish is in flight; otherwise the newest waits
/// (one at most) and goes out when the one in flight is done. While it does not lead it applies the snapshots it
/// receives to its <see cref="LiveState"/> (so pages, <c>/api/state</c> and hub clients show the leader's state)
/// straight from StackExchange.Redis's handler, not through an ordered queue: messages may be handled out of order,
/// which is harmless because <see cref="LiveState.ApplyRemote"/> drops any snapshot older (epoch, then version) than
/// the one shown. Once it has heard nothing for <see cref="FanoutOptions.LeaderSilence"/> on the real clock it marks
/// the state shown NOT LIVE on every screen.
/// </summary>
public sealed class SnapshotFanout(
    RedisLink redis,
    LiveState live,
    ILeadership leadership,
    IOptions<FanoutOptions> options,
    [FromKeyedServices(OpsLvp.Web.Time.TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
    ILogger<SnapshotFanout> logger,
    OpsLvp.Data.Stores.ReadingInboxStore? inbox = null) : BackgroundService
{
    /// <summary>Channel name under the prefix.</summary>
    public const string ChannelName = "snapshots";

    private readonly FanoutOptions _options = options.Value;

    // The send side: the snapshot waiting to be published (newest only) and whether a publish is in flight.
    private readonly Lock _sendLock = new();
    private (LiveSnapshot Snapshot, long Epoch)? _pending;
    private bool _sending;
    private ISubscriber? _subscriber;
    private RedisChannel _channel;

    private long _lastReceivedTicks; // real UTC ticks of the last state received from a leader; 0 = none yet
    private long _quietSinceTicks = realClock.GetUtcNow().UtcTicks; // real UTC ticks from which silence counts: start, or last time this node led
    private bool _markedNotLive;

    // While marked NOT LIVE: the snapshot marked, why, the inbox count shown and when it was last asked (real ticks).
    private LiveSnapshot? _notLiveBase;
    private LiveSnapshot? _notLiveShown;
    private string? _notLiveWhy;
    private int _queuedShown;
    private long _queuedAskedTicks;

    /// <summary>How often a NOT LIVE node asks the reading inbox how many batches wait, to keep its banner's count current.</summary>
    internal static readonly TimeSpan QueuedRefresh = TimeSpan.FromSeconds(2);

    /// <summary>Real UTC time the last state from a leader arrived; null before the first (<c>/health</c>).</summary>
    public DateTimeOffset? LastReceivedAt => Interlocked.Read(ref _lastReceivedTicks) is var t and > 0 ? new DateTimeOffset(t, TimeSpan.Zero) : null;

    /// <summary>Whether a state from a leader arrived within <see cref="FanoutOptions.LeaderSilence"/> (a standby's screens are live).</summary>
    public bool HearsLeader => redis.Enabled && LastReceivedAt is { } at && realClock.GetUtcNow() - at < _options.LeaderSilence;

    /// <summary>
    /// Called by <see cref="LiveState.PublishedOwn"/> on the publisher's thread: publishes at once unless a publish is
    /// in flight, in which case the snapshot waits (replacing any older one waiting) for it to finish.
    /// </summary>
    private void OnPublishedOwn(LiveSnapshot snapshot, long epoch)
    {
        lock (_sendLock)
        {
            _pending = (snapshot, epoch);
            if (_sending)
            {
                return;
            }
            _sending = true;
        }
        SendPending();
    }

    /// <summary>Publishes the waiting snapshots one after the other; returns when none waits or a publish is still in flight.</summary>
    private void SendPending()
    {
        while (true)
        {
            (LiveSnapshot Snapshot, long Epoch) next;
            lock (_sendLock)
            {
                if (_pending is not { } pending)
                {
                    _sending = false;
                    return;
                }
                next = pending;
                _pending = null;
            }
            var publish = PublishAsync(next.Snapshot, next.Epoch);
            if (!publish.IsCompleted)
            {
                // the continuation sends whatever arrived meanwhile; PublishAsync never faults
                _ = publish.ContinueWith(static (_, state) => ((SnapshotFanout)state!).SendPending(), this, CancellationToken.None,
                    TaskContinuationOptions.None, TaskScheduler.Default);
                return;
            }
        }
    }

    private async Task PublishAsync(LiveSnapshot snapshot, long epoch)
    {
        if (!leadership.IsLeader || Volatile.Read(ref _subscriber) is not { } subscriber)
        {
            return;
        }
        try
        {
            var body = JsonSerializer.SerializeToUtf8Bytes(new SnapshotMessage(leadership.NodeId, epoch, snapshot), LiveJson.Options);
            await subscriber.PublishAsync(_channel, body);
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException or ObjectDisposedException)
        {
            logger.LogWarning(ex, "Snapshot {Version} not fanned out: Cluster:Redis not reachable", snapshot.Version);
        }
        catch (Exception ex) when (ex is JsonException or NotSupportedException)
        {
            logger.LogError(ex, "Snapshot {Version} not fanned out: it could not be written as JSON", snapshot.Version);
        }
    }

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        if (!redis.Enabled)
        {
            return;
        }
        // the watch runs whatever Redis does: a standby that cannot hear the leader must say so
        var watch = WatchAsync(stoppingToken);
        IConnectionMultiplexer connection;
        try
        {
            connection = await redis.Connection.WaitAsync(stoppingToken);
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException || (ex is OperationCanceledException && !stoppingToken.IsCancellationRequested))
        {
            await IgnoreCancellation(watch); // RedisLink logged why
            return;
        }
        catch (OperationCanceledException)
        {
            await IgnoreCancellation(watch);
            return;
        }
        var subscriber = connection.GetSubscriber();
        var channel = redis.Channel(ChannelName);
        _channel = channel;
        Volatile.Write(ref _subscriber, subscriber);
        Action<RedisChannel, RedisValue> handler = (_, value) => Receive(value);
        var subscribed = false;
        live.PublishedOwn += OnPublishedOwn;
        try
        {
            // a handler called by StackExchange.Redis for each message (no ordered queue): see the class summary
            await subscriber.SubscribeAsync(channel, handler);
            subscribed = true;
            await watch;
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException)
        {
            logger.LogError(ex, "Cluster:Redis: the snapshot channel could not be subscribed; this node cannot show a leader's states");
            await IgnoreCancellation(watch);
        }
        finally
        {
            live.PublishedOwn -= OnPublishedOwn;
            Volatile.Write(ref _subscriber, null);
            if (subscribed)
            {
                await subscriber.UnsubscribeAsync(channel, handler);
            }
        }
    }

    private static async Task IgnoreCancellation(Task task)
    {
        try
        {
            await task;
        }
        catch (OperationCanceledException)
        {
        }
    }

    private void Receive(RedisValue value)
    {
        if (leadership.IsLeader || value.IsNullOrEmpty)
        {
            return;
        }
        SnapshotMessage? message;
        try
        {
            message = JsonSerializer.Deserialize<SnapshotMessage>((byte[])value!, LiveJson.Options);
        }
        catch (JsonException ex)
        {
            logger.LogWarning(ex, "Ignored a snapshot message that is not one ({Length} bytes)", ((byte[])value!).Length);
            return;
        }
        if (message?.Snapshot is null)
        {
            return;
        }
        if (message.Node == leadership.NodeId)
        {
            return; // our own, sent while we led
        }
        Interlocked.Exchange(ref _lastReceivedTicks, realClock.GetUtcNow().UtcTicks);
        _markedNotLive = false;
        live.ApplyRemote(message.Snapshot, message.Epoch);
    }

    private async Task WatchAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(TimeSpan.FromMilliseconds(Math.Clamp(_options.LeaderSilence.TotalMilliseconds / 10, 50, 1000)), realClock);
        while (await timer.WaitForNextTickAsync(stoppingToken))
        {
            var now = realClock.GetUtcNow().UtcTicks;
            if (leadership.IsLeader)
            {
                Interlocked.Exchange(ref _quietSinceTicks, now);
                _markedNotLive = false;
                continue;
            }
            // silence on the one real clock: since the last state heard, or since this node started or last led
            var heard = Math.Max(Interlocked.Read(ref _lastReceivedTicks), Interlocked.Read(ref _quietSinceTicks));
            if (_markedNotLive)
            {
                await FollowQueuedAsync(now, stoppingToken);
                continue;
            }
            if (TimeSpan.FromTicks(now - heard) < _options.LeaderSilence)
            {
                continue;
            }
            if ((live.Current ?? live.OwnLatest) is not { } last)
            {
                continue; // nothing to show yet; /api/state answers 503 and pages wait
            }
            _notLiveBase = last;
            _notLiveWhy = redis.IsConnected ? null : "The fan-out (Cluster:Redis) is not connected.";
            _queuedShown = await QueuedAsync(stoppingToken) ?? 0;
            _queuedAskedTicks = now;
            MarkNotLive();
            _markedNotLive = true;
            logger.LogWarning("No state from the engine node for {Silence}: screens on this node say NOT LIVE", _options.LeaderSilence);
        }
    }

    private void MarkNotLive()
    {
        var last = _notLiveBase!;
        var marked = last with
        {
            Recording = new RecordingView(false, last.At, NodeWords.NotLiveReason(_notLiveWhy, _queuedShown), NodeWords.NotLiveHeadline),
        };
        _notLiveShown = marked;
        live.MarkNotLive(marked, live.CurrentEpoch);
    }

    /// <summary>
    /// While NOT LIVE, asks the reading inbox every <see cref="QueuedRefresh"/> how many batches wait and, when the
    /// count changed and the marked state is still the one shown (no leader state arrived meanwhile), marks it again
    /// with the new count.
    /// </summary>
    private async Task FollowQueuedAsync(long now, CancellationToken stoppingToken)
    {
        if (TimeSpan.FromTicks(now - _queuedAskedTicks) < QueuedRefresh)
        {
            return;
        }
        _queuedAskedTicks = now;
        if (await QueuedAsync(stoppingToken) is not { } queued || queued == _queuedShown)
        {
            return;
        }
        if (_markedNotLive && ReferenceEquals(live.Current, _notLiveShown))
        {
            _queuedShown = queued;
            MarkNotLive();
        }
    }

    /// <summary>Reading batches waiting in the inbox; null when there is no inbox or the database did not answer in time.</summary>
    private async Task<int?> QueuedAsync(CancellationToken stoppingToken)
    {
        if (inbox is null)
        {
            return null;
        }
        using var timeout = CancellationTokenSource.CreateLinkedTokenSource(stoppingToken);
        timeout.CancelAfter(TimeSpan.FromSeconds(2));
        try
        {
            return (await inbox.WaitingAsync(timeout.Token)).Batches;
        }
        catch (Exception ex) when (ex is not OperationCanceledException || !stoppingToken.IsCancellationRequested)
        {
            logger.LogDebug(ex, "Reading inbox count not available for the NOT LIVE banner");
            return null;
        }
    }
}
