using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Review;

/// <summary>How one checklist item went in an episode.</summary>
/// <param name="DueAt">Opened + the profile's due-within minutes.</param>
/// <param name="DoneAt">When it was (last) ticked done; null when it never was, or the tick was undone.</param>
/// <param name="DoneBy">Who ticked it, and for which team.</param>
/// <param name="Late">Done after its due time, or not done by the end; false when done in time.</param>
/// <param name="Outcome">"done", "not_applicable" (docs/engine.md R13), "open", "closed_not_done" or "voided".</param>
public sealed record ItemPerformance(
    string ItemId,
    Phase Phase,
    string Team,
    bool Mandatory,
    DateTimeOffset OpenedAt,
    DateTimeOffset DueAt,
    DateTimeOffset? DoneAt,
    string? DoneBy,
    string? DoneForTeam,
    bool Late,
    string Outcome)
{
    /// <summary>Opened → done, when done.</summary>
    public TimeSpan? TimeToDone => DoneAt - OpenedAt;
}
