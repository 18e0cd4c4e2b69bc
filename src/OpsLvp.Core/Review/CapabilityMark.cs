namespace OpsLvp.Core.Review;

/// <summary>
/// One runway direction's capability change on an episode's timeline (docs/capability.md, from a recorded
/// <c>capability_changed</c> event): when, which direction, whether in use, the headline before (null at the first
/// evaluation) and after, and afterwards, per operation not available, its first reason ("CAT III: TDZ lights 07L unserviceable (…)";
/// empty when all are available).
/// </summary>
public sealed record CapabilityMark(DateTimeOffset At, string Direction, bool InUse, string? Before, string After, IReadOnlyList<string> NotAvailable);
