using System.Collections.Concurrent;
using System.Diagnostics;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Components.Testing;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Live;

/// <summary>The in-process notifier: subscribers are independent of each other and of the publisher.</summary>
public sealed class LiveStateTests
{
    private static LiveSnapshot Snapshot(long version) => new(
        version, DateTimeOffset.UnixEpoch, new AerodromeView("XTST", "Test Field (invented)", "UTC", "t", true),
        null!, [], [], [], [], null);

    [Fact]
    public async Task ThrowingAndSlowSubscribers_DoNotBlockOthers_AndDisposedOnesGetNothing()
    {
        var state = new LiveState(NullLogger<LiveState>.Instance);
        var got = new TaskCompletionSource<long>(TaskCreationOptions.RunContinuationsAsynchronously);
        var release = new TaskCompletionSource();
        var disposedCalls = 0;
        using var slow = state.Subscribe(async _ => await release.Task);
        using var throwing = state.Subscribe(_ => throw new InvalidOperationException("subscriber failure (test)"));
        var disposed = state.Subscribe(_ =>
        {
            Interlocked.Increment(ref disposedCalls);
            return Task.CompletedTask;
        });
        disposed.Dispose();
        using var good = state.Subscribe(s =>
        {
            got.TrySetResult(s.Version);
            return Task.CompletedTask;
        });

        state.Publish(Snapshot(1)); // returns at once although one subscriber never finishes
        Assert.Equal(1, await got.Task.WaitAsync(TimeSpan.FromSeconds(5)));
        Assert.Equal(1, state.Current!.Version);
        state.Publish(Snapshot(1)); // not newer: ignored
        Assert.Equal(0, Volatile.Read(ref disposedCalls));
        release.SetResult();
    }

    private static LiveState Limited(double perSecond) =>
        new(NullLogger<LiveState>.Instance, Options.Create(new LiveOptions { MaxStatesPerSecond = perSecond }));

    [Fact]
    public async Task ASubscriber_GetsAtMostTheConfiguredRate_AndAlwaysTheLatest()
    {
        // The demo published about 25 snapshots a second to every client (issue 12); 40 a second here.
        var state = Limited(4);
        var received = new ConcurrentQueue<long>();
        using var subscription = state.Subscribe(s =>
        {
            received.Enqueue(s.Version);
            return Task.CompletedTask;
        });

        var watch = Stopwatch.StartNew();
        for (var v = 1; v <= 40; v++)
        {
            state.Publish(TestSnapshots.Make(v, Phase.Preparation));
            await Task.Delay(25);
        }
        var span = watch.Elapsed;
        await Eventually.TrueAsync(() => received.Contains(40), "the latest snapshot delivered");

        // At most one at once plus 4 a second over the publishing time (the bound grows with a slow machine's span).
        Assert.True(received.Count <= 2 + (4 * span.TotalSeconds), $"{received.Count} deliveries in {span.TotalSeconds:0.0} s");
        Assert.Equal(received.Order(), received);
        Assert.Equal(40, received.Last());
    }

    [Fact]
    public async Task APhaseChange_IsDeliveredAtOnce_NotAfterTheInterval()
    {
        var state = Limited(0.02); // 50 s between ordinary deliveries
        var received = new ConcurrentQueue<long>();
        using var subscription = state.Subscribe(s =>
        {
            received.Enqueue(s.Version);
            return Task.CompletedTask;
        });
        state.Publish(TestSnapshots.Make(1, Phase.Normal));
        await Eventually.TrueAsync(() => received.Contains(1), "the first snapshot");

        state.Publish(TestSnapshots.Make(2, Phase.Normal));     // same phase: waits for the interval
        state.Publish(TestSnapshots.Make(3, Phase.Preparation)); // new phase: replaces it and goes now

        // Far less than the 50 s interval, with room for a busy machine.
        await Eventually.TrueAsync(() => received.Contains(3), "the phase change", TimeSpan.FromSeconds(20));
        Assert.Equal([1L, 3L], received);
    }
}
