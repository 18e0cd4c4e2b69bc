using Microsoft.Extensions.Time.Testing;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Tests.Time;

/// <summary>Demo clock over a fake real clock. Start instant and speeds are invented test values.</summary>
public sealed class AcceleratedTimeProviderTests
{
    private static readonly DateTimeOffset s_demoStart = new(2026, 1, 15, 2, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Now_IsStartPlusRealElapsedTimesSpeed()
    {
        var real = new FakeTimeProvider(new DateTimeOffset(2030, 6, 1, 12, 0, 0, TimeSpan.Zero));
        var demo = new AcceleratedTimeProvider(real, s_demoStart, 30);

        Assert.Equal(s_demoStart, demo.GetUtcNow());
        real.Advance(TimeSpan.FromSeconds(2));
        Assert.Equal(s_demoStart.AddMinutes(1), demo.GetUtcNow());
        real.Advance(TimeSpan.FromMilliseconds(500));
        Assert.Equal(s_demoStart.AddSeconds(75), demo.GetUtcNow());
    }

    [Fact]
    public void SpeedOne_RunsInRealTime()
    {
        var real = new FakeTimeProvider();
        var demo = new AcceleratedTimeProvider(real, s_demoStart, 1);

        real.Advance(TimeSpan.FromMinutes(7));

        Assert.Equal(s_demoStart.AddMinutes(7), demo.GetUtcNow());
    }

    [Fact]
    public void StartWithOffset_IsReportedInUtc()
    {
        var demo = new AcceleratedTimeProvider(new FakeTimeProvider(), new DateTimeOffset(2026, 1, 15, 3, 0, 0, TimeSpan.FromHours(1)), 30);

        Assert.Equal(TimeSpan.Zero, demo.GetUtcNow().Offset);
        Assert.Equal(s_demoStart, demo.GetUtcNow());
    }

    [Fact]
    public async Task Delay_InDemoTime_CompletesAfterDueDividedBySpeedOfRealTime()
    {
        var real = new FakeTimeProvider();
        var demo = new AcceleratedTimeProvider(real, s_demoStart, 30);

        var delay = Task.Delay(TimeSpan.FromMinutes(1), demo);
        real.Advance(TimeSpan.FromMilliseconds(1999));
        Assert.False(delay.IsCompleted);
        real.Advance(TimeSpan.FromMilliseconds(1));
        await delay.WaitAsync(TimeSpan.FromSeconds(5));

        Assert.Equal(s_demoStart.AddMinutes(1), demo.GetUtcNow());
    }

    [Fact]
    public void PeriodicTimer_ChangedToNewPeriod_FiresAtScaledPeriod()
    {
        var real = new FakeTimeProvider();
        var demo = new AcceleratedTimeProvider(real, s_demoStart, 60);
        var ticks = 0;
        using var timer = demo.CreateTimer(_ => Interlocked.Increment(ref ticks), null, TimeSpan.FromMinutes(1), TimeSpan.FromMinutes(1));

        real.Advance(TimeSpan.FromSeconds(1));
        Assert.Equal(1, Volatile.Read(ref ticks));
        real.Advance(TimeSpan.FromSeconds(2));
        Assert.Equal(3, Volatile.Read(ref ticks));

        timer.Change(TimeSpan.FromMinutes(10), TimeSpan.FromMinutes(10));
        real.Advance(TimeSpan.FromSeconds(9));
        Assert.Equal(3, Volatile.Read(ref ticks));
        real.Advance(TimeSpan.FromSeconds(1));
        Assert.Equal(4, Volatile.Read(ref ticks));
    }

    [Fact]
    public void ElapsedTime_FromTimestamps_IsAccelerated()
    {
        var real = new FakeTimeProvider();
        var demo = new AcceleratedTimeProvider(real, s_demoStart, 30);
        var start = demo.GetTimestamp();

        real.Advance(TimeSpan.FromSeconds(4));

        Assert.Equal(TimeSpan.FromMinutes(2), demo.GetElapsedTime(start));
    }

    [Theory]
    [InlineData(0)]
    [InlineData(0.5)]
    [InlineData(3601)]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    public void SpeedOutsideOneTo3600_IsRefused(double speed)
    {
        var ex = Assert.Throws<ArgumentOutOfRangeException>(() => new AcceleratedTimeProvider(new FakeTimeProvider(), s_demoStart, speed));

        Assert.Equal("speed", ex.ParamName);
    }
}
