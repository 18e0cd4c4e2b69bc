namespace OpsLvp.Web.Time;

/// <summary>
/// Demo clock: simulated UTC = <c>start + real elapsed × speed</c>, measured on an inner clock
/// (<see cref="TimeProvider.System"/> in the app, a fake clock in tests). Timers and delays created
/// through it fire after <c>due ÷ speed</c> of inner time, so <c>Task.Delay(d, provider)</c> waits
/// <c>d</c> of demo time. Timestamps run at the same accelerated rate.
/// </summary>
public sealed class AcceleratedTimeProvider : TimeProvider
{
    private readonly TimeProvider _inner;
    private readonly DateTimeOffset _start;
    private readonly long _innerStartTimestamp;

    /// <param name="inner">The real clock underneath.</param>
    /// <param name="start">The simulated instant at the moment of construction.</param>
    /// <param name="speed">Acceleration factor, at least 1 (1 = real time) and at most <see cref="MaxSpeed"/>.</param>
    public AcceleratedTimeProvider(TimeProvider inner, DateTimeOffset start, double speed)
    {
        ArgumentNullException.ThrowIfNull(inner);
        if (!double.IsFinite(speed) || speed < 1 || speed > MaxSpeed)
        {
            throw new ArgumentOutOfRangeException(nameof(speed), speed, $"Demo speed must be between 1 and {MaxSpeed}.");
        }

        _inner = inner;
        _start = start.ToUniversalTime();
        Speed = speed;
        _innerStartTimestamp = inner.GetTimestamp();
    }

    /// <summary>Largest accepted acceleration factor.</summary>
    public const double MaxSpeed = 3600;

    /// <summary>Acceleration factor: simulated seconds per real second.</summary>
    public double Speed { get; }

    public override TimeZoneInfo LocalTimeZone => TimeZoneInfo.Utc;

    public override long TimestampFrequency => _inner.TimestampFrequency;

    public override DateTimeOffset GetUtcNow()
    {
        var realElapsed = _inner.GetElapsedTime(_innerStartTimestamp);
        return _start + TimeSpan.FromTicks(checked((long)(realElapsed.Ticks * Speed)));
    }

    public override long GetTimestamp()
    {
        var innerElapsed = _inner.GetTimestamp() - _innerStartTimestamp;
        return _innerStartTimestamp + checked((long)(innerElapsed * Speed));
    }

    public override ITimer CreateTimer(TimerCallback callback, object? state, TimeSpan dueTime, TimeSpan period)
    {
        return new ScaledTimer(this, _inner.CreateTimer(callback, state, ToInner(dueTime), ToInner(period)));
    }

    private TimeSpan ToInner(TimeSpan simulated)
    {
        if (simulated == Timeout.InfiniteTimeSpan || simulated <= TimeSpan.Zero)
        {
            return simulated;
        }

        var ticks = (long)Math.Ceiling(simulated.Ticks / Speed);
        return TimeSpan.FromTicks(Math.Max(1, ticks));
    }

    private sealed class ScaledTimer(AcceleratedTimeProvider owner, ITimer inner) : ITimer
    {
        public bool Change(TimeSpan dueTime, TimeSpan period) => inner.Change(owner.ToInner(dueTime), owner.ToInner(period));

        public void Dispose() => inner.Dispose();

        public ValueTask DisposeAsync() => inner.DisposeAsync();
    }
}
