using OpsLvp.Web.Live;

namespace OpsLvp.Web.Tests.Components.Testing;

/// <summary>Test-only <see cref="ILiveState"/>: tests publish snapshots by hand (integration tests use the real host).</summary>
public sealed class TestLiveState : ILiveState
{
    private readonly List<Func<LiveSnapshot, Task>> _subscribers = [];

    public LiveSnapshot? Current { get; private set; }

    public int SubscriberCount
    {
        get
        {
            lock (_subscribers)
            {
                return _subscribers.Count;
            }
        }
    }

    public IDisposable Subscribe(Func<LiveSnapshot, Task> onChange)
    {
        lock (_subscribers)
        {
            _subscribers.Add(onChange);
        }
        return new Handle(this, onChange);
    }

    /// <summary>Sets <see cref="Current"/> and calls every subscriber.</summary>
    public async Task PublishAsync(LiveSnapshot snapshot)
    {
        Current = snapshot;
        Func<LiveSnapshot, Task>[] all;
        lock (_subscribers)
        {
            all = [.. _subscribers];
        }
        foreach (var subscriber in all)
        {
            await subscriber(snapshot);
        }
    }

    /// <summary>Sets <see cref="Current"/> without notifying (state before a component renders).</summary>
    public void Set(LiveSnapshot snapshot) => Current = snapshot;

    private sealed class Handle(TestLiveState owner, Func<LiveSnapshot, Task> onChange) : IDisposable
    {
        public void Dispose()
        {
            lock (owner._subscribers)
            {
                owner._subscribers.Remove(onChange);
            }
        }
    }
}
