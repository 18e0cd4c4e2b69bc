using System.Diagnostics;
using System.Text.Json;
using System.Threading.Channels;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Live;
using StackExchange.Redis;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// Snapshot fan-out over Redis (docs/deployment.md "Fan-out and commands between nodes"). While this node leads it
/// publishes every snapshot its engine makes current on channel <c>&lt;prefix&gt;:snapshots</c>, newest first (one
/// waiting at most). While it does not lead it applies the snapshots it receives to its <see cref="LiveState"/> (so
/// pages, <c>/api/state</c> and hub clients show the leader's state), and once it has heard nothing for
/// <see cref="FanoutOptions.LeaderSilence"/> it marks the state shown NOT LIVE on every screen.
/// </summary>
public sealed class SnapshotFanout(
    RedisLink redis,
    LiveState live,
    ILeadership leadership,
    IOptions<FanoutOptions> options,
    [FromKeyedServices(OpsLvp.Web.Time.TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
    ILogger<SnapshotFanout> logger) : BackgroundService
{
    /// <summary>Channel name under the prefix.</summary>
    public const string ChannelName = "snapshots";

    private readonly FanoutOptions _options = options.Value;
    private readonly Channel<(LiveSnapshot Snapshot, long Epoch)> _outbox =
        Channel.CreateBounded<(LiveSnapshot, long)>(new BoundedChannelOptions(1) { FullMode = BoundedChannelFullMode.DropOldest, SingleReader = true });

    private long _lastHeard = Stopwatch.GetTimestamp();
    private long _lastReceivedTicks; // real UTC ticks of the last state received from a leader; 0 = none yet
    private bool _markedNotLive;

    /// <summary>Real UTC time the last state from a leader arrived; null before the first (<c>/health</c>).</summary>
    public DateTimeOffset? LastReceivedAt => Interlocked.Read(ref _lastReceivedTicks) is var t and > 0 ? new DateTimeOffset(t, TimeSpan.Zero) : null;

    /// <summary>Whether a state from a leader arrived within <see cref="FanoutOptions.LeaderSilence"/> (a standby's screens are live).</summary>
    public bool HearsLeader => redis.Enabled && LastReceivedAt is { } at && realClock.GetUtcNow() - at < _options.LeaderSilence;

    private void OnPublishedOwn(LiveSnapshot snapshot, long epoch) => _outbox.Writer.TryWrite((snapshot, epoch));

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
        ChannelMessageQueue? queue = null;
        live.PublishedOwn += OnPublishedOwn;
        try
        {
            queue = await subscriber.SubscribeAsync(channel);
            queue.OnMessage(message => Receive(message.Message));
            await Task.WhenAll(SendAsync(subscriber, channel, stoppingToken), watch);
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException)
        {
            logger.LogError(ex, "Cluster:Redis: the snapshot channel could not be subscribed; this node cannot fan out states");
            await IgnoreCancellation(watch);
        }
        finally
        {
            live.PublishedOwn -= OnPublishedOwn;
            if (queue is not null)
            {
                await queue.UnsubscribeAsync();
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

    private async Task SendAsync(ISubscriber subscriber, RedisChannel channel, CancellationToken stoppingToken)
    {
        await foreach (var (snapshot, epoch) in _outbox.Reader.ReadAllAsync(stoppingToken))
        {
            if (!leadership.IsLeader)
            {
                continue;
            }
            try
            {
                var body = JsonSerializer.SerializeToUtf8Bytes(new SnapshotMessage(leadership.NodeId, epoch, snapshot), LiveJson.Options);
                await subscriber.PublishAsync(channel, body);
            }
            catch (Exception ex) when (ex is RedisException or TimeoutException or ObjectDisposedException)
            {
                logger.LogWarning(ex, "Snapshot {Version} not fanned out: Cluster:Redis not reachable", snapshot.Version);
            }
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
        Interlocked.Exchange(ref _lastHeard, Stopwatch.GetTimestamp());
        Interlocked.Exchange(ref _lastReceivedTicks, realClock.GetUtcNow().UtcTicks);
        _markedNotLive = false;
        live.ApplyRemote(message.Snapshot, message.Epoch);
    }

    private async Task WatchAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(TimeSpan.FromMilliseconds(Math.Clamp(_options.LeaderSilence.TotalMilliseconds / 10, 50, 1000)));
        while (await timer.WaitForNextTickAsync(stoppingToken))
        {
            if (leadership.IsLeader)
            {
                Interlocked.Exchange(ref _lastHeard, Stopwatch.GetTimestamp());
                _markedNotLive = false;
                continue;
            }
            if (_markedNotLive || Stopwatch.GetElapsedTime(Interlocked.Read(ref _lastHeard)) < _options.LeaderSilence)
            {
                continue;
            }
            if ((live.Current ?? live.OwnLatest) is not { } last)
            {
                continue; // nothing to show yet; /api/state answers 503 and pages wait
            }
            var why = redis.IsConnected ? null : "The fan-out (Cluster:Redis) is not connected.";
            var marked = last with { Recording = new RecordingView(false, last.At, NodeWords.NotLiveReason(why), NodeWords.NotLiveHeadline) };
            live.MarkNotLive(marked, live.CurrentEpoch);
            _markedNotLive = true;
            logger.LogWarning("No state from the engine node for {Silence}: screens on this node say NOT LIVE", _options.LeaderSilence);
        }
    }
}
