using OpsLvp.Web.Live;

namespace OpsLvp.Web.Tests.Components.Wall;

/// <summary>A test-only <see cref="ILiveState"/>: tests set the current snapshot and publish new ones by hand.</summary>
public sealed class FakeLiveState : ILiveState
{
    private readonly List<Func<LiveSnapshot, Task>> _handlers = [];
    private readonly Lock _gate = new();

    public LiveSnapshot? Current { get; private set; }

    public int SubscriberCount
    {
        get
        {
            lock (_gate)
            {
                return _handlers.Count;
            }
        }
    }

    public void SetInitial(LiveSnapshot? snapshot) => Current = snapshot;

    /// <summary>Makes <paramref name="snapshot"/> current and hands it to every subscriber.</summary>
    public async Task PublishAsync(LiveSnapshot snapshot)
    {
        Current = snapshot;
        List<Func<LiveSnapshot, Task>> handlers;
        lock (_gate)
        {
            handlers = [.. _handlers];
        }
        foreach (var handler in handlers)
        {
            await handler(snapshot);
        }
    }

    public IDisposable Subscribe(Func<LiveSnapshot, Task> onChange)
    {
        lock (_gate)
        {
            _handlers.Add(onChange);
        }
        return new Subscription(this, onChange);
    }

    private sealed class Subscription(FakeLiveState owner, Func<LiveSnapshot, Task> handler) : IDisposable
    {
        public void Dispose()
        {
            lock (owner._gate)
            {
                owner._handlers.Remove(handler);
            }
        }
    }
}
