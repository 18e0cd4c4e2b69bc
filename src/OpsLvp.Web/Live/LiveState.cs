using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Live;

/// <summary>
/// The singleton <see cref="ILiveState"/>: the engine host publishes, Blazor circuits and the hub subscribe.
/// Handlers are called outside the lock, each on its own, so a slow or throwing subscriber never blocks or
/// breaks the others or the publisher. Each subscriber gets at most <see cref="LiveOptions.MaxStatesPerSecond"/>
/// snapshots a second: in between, a newer snapshot replaces the one waiting, so the latest always arrives, and a
/// snapshot whose phase differs from the last delivered one goes out without waiting for the interval.
/// </summary>
public sealed class LiveState(ILogger<LiveState> logger, IOptions<LiveOptions>? options = null) : ILiveState
{
    private readonly TimeSpan _minInterval = (options?.Value ?? new LiveOptions()).MinInterval;

    private readonly Lock _lock = new();
    private readonly List<Subscription> _subscriptions = [];
    private LiveSnapshot? _current;

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

    /// <summary>Makes <paramref name="snapshot"/> current and hands it to every subscriber without waiting for them.</summary>
    public void Publish(LiveSnapshot snapshot)
    {
        ArgumentNullException.ThrowIfNull(snapshot);
        Subscription[] targets;
        lock (_lock)
        {
            if (_current is not null && snapshot.Version <= _current.Version)
            {
                return;
            }
            _current = snapshot;
            targets = [.. _subscriptions];
        }
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
