using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Review;

/// <summary>
/// One episode (leaving normal to returning to it) as reconstructed from its recorded events and readings.
/// </summary>
/// <param name="Id">The engine's episode id.</param>
/// <param name="End">When normal was re-entered; null while the episode is still running.</param>
/// <param name="LowestRvrM">Lowest accepted-status (ok) RVR reading in the episode, metres; null when none.</param>
/// <param name="LowestCeilingFt">Lowest ok cloud base or vertical visibility reading in the episode, feet; null when none.</param>
/// <param name="Alarms">Alarms raised in the episode.</param>
/// <param name="Confirmations">Pending transitions a duty manager confirmed.</param>
/// <param name="ManualActions">Manual actions applied (declare, cancel, hold release, forecast, sensor service).</param>
/// <param name="Ticks">Checklist items ticked done.</param>
/// <param name="Phases">The phase intervals from start to end (or to the review instant while running).</param>
public sealed record EpisodeSummary(
    string Id,
    DateTimeOffset Start,
    DateTimeOffset? End,
    Phase DeepestPhase,
    double? LowestRvrM,
    string? LowestRvrSensor,
    double? LowestCeilingFt,
    string? LowestCeilingSensor,
    int Alarms,
    IReadOnlyList<TransitionMark> Transitions,
    int Confirmations,
    int ManualActions,
    int Ticks,
    IReadOnlyList<PhaseSpan> Phases)
{
    /// <summary>How early preparation started compared with the first forecast that called for it (docs/review.md); null when none did.</summary>
    public ForecastLead? ForecastLead { get; init; }

    /// <summary>Forecasts (TAF, TREND) received during the episode.</summary>
    public int ForecastsReceived { get; init; }

    /// <summary>Total time spent in <paramref name="phase"/> within the episode.</summary>
    public TimeSpan TimeIn(Phase phase) => Phases.Where(p => p.Phase == phase).Aggregate(TimeSpan.Zero, (sum, p) => sum + p.Duration);
}
