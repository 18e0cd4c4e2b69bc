namespace OpsLvp.Core.Review;

/// <summary>
/// One runway direction's capability over a review window (docs/capability.md "Review"): consecutive segments from the
/// window start (or the first recorded capability) to its end. <paramref name="InUse"/>: in use at the window end.
/// </summary>
public sealed record CapabilityBand(string Direction, bool InUse, IReadOnlyList<CapabilitySegment> Segments)
{
    /// <summary>The segment covering <paramref name="at"/>, or null before the first one or after the window.</summary>
    public CapabilitySegment? At(DateTimeOffset at) =>
        Segments.FirstOrDefault(s => s.Start <= at && at < s.End) ?? (Segments.Count > 0 && Segments[^1].End == at ? Segments[^1] : null);
}
