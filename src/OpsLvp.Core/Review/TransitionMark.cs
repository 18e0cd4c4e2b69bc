using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Review;

/// <summary>A phase change as the review shows it.</summary>
/// <param name="By">"auto" or "manual".</param>
/// <param name="Actor">The person for manual and confirmed transitions.</param>
/// <param name="ProposedAt">For a confirmed transition, when it was proposed.</param>
public sealed record TransitionMark(DateTimeOffset At, Phase From, Phase To, string By, string? Actor, string Reason, DateTimeOffset? ProposedAt);
