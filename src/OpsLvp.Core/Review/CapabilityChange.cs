namespace OpsLvp.Core.Review;

/// <summary>
/// One change of a runway direction's capability, as the exports carry it (docs/review.md): when, the state before
/// (null: none known before, e.g. the first evaluation) and after.
/// </summary>
public sealed record CapabilityChange(DateTimeOffset At, CapabilityState? Before, CapabilityState After)
{
    public string Direction => After.Direction;
}
