namespace OpsLvp.Core.Review;

/// <summary>One stretch of a runway direction's capability band: from <paramref name="Start"/> to <paramref name="End"/> the direction supported <paramref name="State"/>.</summary>
public sealed record CapabilitySegment(DateTimeOffset Start, DateTimeOffset End, CapabilityState State)
{
    public TimeSpan Duration => End - Start;
}
