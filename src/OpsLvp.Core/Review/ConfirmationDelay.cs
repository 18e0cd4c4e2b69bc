using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Review;

/// <summary>A pending transition (docs/engine.md R10): when the condition made it due, and when (if) a duty manager confirmed it.</summary>
/// <param name="ConfirmedAt">Null when it was withdrawn or is still pending.</param>
/// <param name="Outcome">"confirmed", "withdrawn" or "pending".</param>
public sealed record ConfirmationDelay(Phase From, Phase To, DateTimeOffset ProposedAt, DateTimeOffset? ConfirmedAt, string? ConfirmedBy, string Outcome)
{
    public TimeSpan? Delay => ConfirmedAt - ProposedAt;
}
