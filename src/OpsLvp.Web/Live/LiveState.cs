using Microsoft.Extensions.Options;
using OpsLvp.Web.Cluster;

namespace OpsLvp.Web.Live;

/// <summary>
/// The singleton <see cref="ILiveState"/>: the engine host publishes, Blazor circuits and the hub subscribe.
/// Handlers are called outside the lock, each on its own, so a slow or throwing subscriber never blocks or
/// breaks the others or the publisher. Each subscriber gets at most <see cref="LiveOptions.MaxStatesPerSecond"/>
/// snapshots a second: in between, a newer snapshot replaces the one waiting, so the latest always arrives, and a
/// snapshot whose phase differs from the last delivered one goes out without waiting for the interval.
/// With several nodes (docs/deployment.md "Fan-out"), a node shows its own engine's snapshots only while it leads and
/// otherwise the leader's, received through <see cref="ApplyRemote"/>; newer epoch first, then newer version, wins.
/// </summary>
public sealed class LiveState(ILogger<LiveState> logger, IOptions<LiveOptions>? options = null, ILeadership? leadership = null) : ILiveState
{
    private readonly TimeSpan _minInterval = (options?.Value ?? new LiveOptions()).MinInterval;

    private readonly Lock _lock = new();
    private readonly List<Subscription> _subscriptions = [];
    private LiveSnapshot? _current;
    private long _currentEpoch = long.MinValue;
    private LiveSnapshot? _ownLatest;

    /// <summary>
    /// Raised (on the publisher's thread, keep it short) with each own snapshot made current while leading, and the
    /// epoch, before the snapshot is handed to this node's subscribers, so the fan-out to the other nodes starts first.
    /// </summary>
    public event Action<LiveSnapshot, long>? PublishedOwn;

    /// <summary>The latest snapshot this node's own engine published, shown or not (a standby's fallback for the not-live marker).</summary>
    public LiveSnapshot? OwnLatest
    {
        get
        {
            lock (_lock)
            {
                return _ownLatest;
            }
        }
    }

    public LiveSnapshot? Current
    {
        get
        {
            lock (_lock)
            {
                return _current;
            }
        }
    }

    public IDisposable Subscribe(Func<LiveSnapshot, Task> onChange)
    {
        ArgumentNullException.ThrowIfNull(onChange);
        var subscription = new Subscription(this, onChange, _minInterval);
        lock (_lock)
        {
            _subscriptions.Add(subscription);
        }
        return subscription;
    }

    /// <summary>
    /// The own engine's path: makes <paramref name="snapshot"/> current and hands it to every subscriber without waiting
    /// for them — only while this node leads (always on a single node); a standby keeps it as <see cref="OwnLatest"/>.
    /// </summary>
    public void Publish(LiveSnapshot snapshot)
    {
        ArgumentNullException.ThrowIfNull(snapshot);
        var epoch = leadership?.Epoch ?? 0;
        lock (_lock)
        {
            _ownLatest = snapshot;
        }
        if (leadership is { IsLeader: false })
        {
            return;
        }
        if (MakeCurrent(snapshot, epoch, force: false) is { } targets)
        {
            try
            {
                PublishedOwn?.Invoke(snapshot, epoch);
            }
            finally
            {
                Deliver(targets, snapshot);
            }
        }
    }

    /// <summary>
    /// The fan-out's path on a node that does not lead: the leader's <paramref name="snapshot"/> of leadership
    /// <paramref name="epoch"/> becomes current unless the one shown is of a newer epoch, or of the same epoch and not
    /// older. Ignored while this node leads. True when it became current.
    /// </summary>
    public bool ApplyRemote(LiveSnapshot snapshot, long epoch)
    {
        ArgumentNullException.ThrowIfNull(snapshot);
        return leadership is not { IsLeader: true } && Offer(snapshot, epoch, force: false);
    }

    /// <summary>
    /// Replaces the snapshot shown by <paramref name="marked"/> (the same values, marked not live) under the same epoch
    /// and version, so any newer snapshot from a leader replaces it again. Ignored while this node leads.
    /// </summary>
    public void MarkNotLive(LiveSnapshot marked, long epoch)
    {
        ArgumentNullException.ThrowIfNull(marked);
        if (leadership is not { IsLeader: true })
        {
            Offer(marked, epoch, force: true);
        }
    }

    /// <summary>The epoch of the snapshot shown (<see cref="long.MinValue"/> before the first).</summary>
    public long CurrentEpoch
    {
        get
        {
            lock (_lock)
            {
                return _currentEpoch;
            }
        }
    }

    private bool Offer(LiveSnapshot snapshot, long epoch, bool force)
    {
        if (MakeCurrent(snapshot, epoch, force) is not { } targets)
        {
            return false;
        }
        Deliver(targets, snapshot);
        return true;
    }

    /// <summary>Makes <paramref name="snapshot"/> current unless an equal or newer one is; the subscribers to hand it to, or null.</summary>
    private Subscription[]? MakeCurrent(LiveSnapshot snapshot, long epoch, bool force)
    {
        lock (_lock)
        {
            if (_current is not null && !force
                && (epoch < _currentEpoch || (epoch == _currentEpoch && snapshot.Version <= _current.Version)))
            {
                return null;
            }
            _current = snapshot;
            _currentEpoch = Math.Max(epoch, _currentEpoch);
            return [.. _subscriptions];
        }
    }

    private void Deliver(Subscription[] targets, LiveSnapshot snapshot)
    {
        foreach (var target in targets)
        {
            _ = target.DeliverAsync(snapshot, logger);
        }
    }

    private void Remove(Subscription subscription)
    {
        lock (_lock)
        {
            _subscriptions.Remove(subscription);
        }
    }

    private sealed class Subscription(LiveState owner, Func<LiveSnapshot, Task> handler, TimeSpan minInterval) : IDisposable
    {
        // Deliveries to one subscriber stay in order; a newer snapshot replaces one still waiting.
        private readonly SemaphoreSlim _gate = new(1, 1);
        private readonly SemaphoreSlim _wake = new(0, 1);
        private LiveSnapshot? _waiting;
        private volatile bool _disposed;
        private long _lastDeliveredAt = long.MinValue;
        private OpsLvp.Core.Engine.Phase? _lastPhase;

        public async Task DeliverAsync(LiveSnapshot snapshot, ILogger logger)
        {
            Interlocked.Exchange(ref _waiting, snapshot);
            Wake();
            await Task.Yield();
            while (true)
            {
                if (!await _gate.WaitAsync(0))
                {
                    return; // the running delivery picks up the waiting snapshot
                }
                try
                {
                    while (!_disposed && Volatile.Read(ref _waiting) is { } peek)
                    {
                        var wait = Due(peek);
                        if (wait > TimeSpan.Zero)
                        {
                            // Woken early by a newer snapshot, which may carry a phase change.
                            await _wake.WaitAsync(wait);
                            continue;
                        }
                        if (Interlocked.Exchange(ref _waiting, null) is not { } next)
                        {
                            break;
                        }
                        try
                        {
                            await handler(next);
                        }
                        catch (Exception ex)
                        {
                            logger.LogWarning(ex, "A live-state subscriber failed on snapshot {Version}", next.Version);
                        }
                        _lastDeliveredAt = System.Diagnostics.Stopwatch.GetTimestamp();
                        _lastPhase = PhaseOf(next);
                    }
                }
                finally
                {
                    _gate.Release();
                }
                if (_disposed || Volatile.Read(ref _waiting) is null)
                {
                    return;
                }
            }
        }

        /// <summary>How long <paramref name="next"/> must still wait; zero for the first, after the interval, or on a phase change.</summary>
        private TimeSpan Due(LiveSnapshot next)
        {
            if (_lastDeliveredAt == long.MinValue || PhaseOf(next) != _lastPhase)
            {
                return TimeSpan.Zero;
            }
            var left = minInterval - System.Diagnostics.Stopwatch.GetElapsedTime(_lastDeliveredAt);
            return left > TimeSpan.Zero ? left : TimeSpan.Zero;
        }

        // Status is null only in snapshots made by hand in tests.
        private static OpsLvp.Core.Engine.Phase? PhaseOf(LiveSnapshot snapshot) => snapshot.Status?.Phase;

        private void Wake()
        {
            try
            {
                if (_wake.CurrentCount == 0)
                {
                    _wake.Release();
                }
            }
            catch (SemaphoreFullException)
            {
                // already awake
            }
        }

        public void Dispose()
        {
            _disposed = true;
            Wake();
            owner.Remove(this);
        }
    }
}
