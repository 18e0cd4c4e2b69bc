using Microsoft.Extensions.Logging.Abstractions;
using OpsLvp.Web.Live;

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
}
