namespace OpsLvp.Web.Live;

/// <summary>
/// The singleton <see cref="ILiveState"/>: the engine host publishes, Blazor circuits and the hub subscribe.
/// Handlers are called outside the lock, each on its own, so a slow or throwing subscriber never blocks or
/// breaks the others or the publisher.
/// </summary>
public sealed class LiveState(ILogger<LiveState> logger) : ILiveState
{
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
        var subscription = new Subscription(this, onChange);
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

    private sealed class Subscription(LiveState owner, Func<LiveSnapshot, Task> handler) : IDisposable
    {
        // Deliveries to one subscriber stay in order; a newer snapshot replaces one still waiting.
        private readonly SemaphoreSlim _gate = new(1, 1);
        private LiveSnapshot? _waiting;
        private volatile bool _disposed;

        public async Task DeliverAsync(LiveSnapshot snapshot, ILogger logger)
        {
            Interlocked.Exchange(ref _waiting, snapshot);
            await Task.Yield();
            while (true)
            {
                if (!await _gate.WaitAsync(0))
                {
                    return; // the running delivery picks up the waiting snapshot
                }
                try
                {
                    while (!_disposed && Interlocked.Exchange(ref _waiting, null) is { } next)
                    {
                        try
                        {
                            await handler(next);
                        }
                        catch (Exception ex)
                        {
                            logger.LogWarning(ex, "A live-state subscriber failed on snapshot {Version}", next.Version);
                        }
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

        public void Dispose()
        {
            _disposed = true;
            owner.Remove(this);
        }
    }
}
