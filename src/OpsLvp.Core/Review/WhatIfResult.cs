using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Review;

/// <summary>
/// Actual against alternative over the same window (the export's first input to its replay end).
/// </summary>
/// <param name="AlternativeEvents">Every event of the alternative replay (as <c>opslvp replay</c> prints them).</param>
/// <param name="ActualActive">Time in force (phase active) as recorded.</param>
/// <param name="AlternativeActive">Time in force with the edited profile.</param>
public sealed record WhatIfResult(
    DateTimeOffset WindowStart,
    DateTimeOffset WindowEnd,
    IReadOnlyList<TransitionMark> Actual,
    IReadOnlyList<TransitionMark> Alternative,
    IReadOnlyList<RecordedEvent> AlternativeEvents,
    IReadOnlyList<PhaseSpan> ActualPhases,
    IReadOnlyList<PhaseSpan> AlternativePhases,
    TimeSpan ActualActive,
    TimeSpan AlternativeActive)
{
    /// <summary>The recorded capability per runway direction over the window (empty without a capability section).</summary>
    public IReadOnlyList<CapabilityBand> ActualCapability { get; init; } = [];

    /// <summary>The alternative's capability per runway direction over the window.</summary>
    public IReadOnlyList<CapabilityBand> AlternativeCapability { get; init; } = [];

    /// <summary>Alternative minus actual time in force: positive means longer in force.</summary>
    public TimeSpan ActiveDifference => AlternativeActive - ActualActive;

    /// <summary>Alternative minus actual number of transitions.</summary>
    public int TransitionDifference => Alternative.Count - Actual.Count;

    /// <summary>Time in <paramref name="phase"/>: actual and alternative.</summary>
    public (TimeSpan Actual, TimeSpan Alternative) TimeIn(Phase phase) =>
        (Sum(ActualPhases, phase), Sum(AlternativePhases, phase));

    private static TimeSpan Sum(IEnumerable<PhaseSpan> spans, Phase phase) =>
        spans.Where(s => s.Phase == phase).Aggregate(TimeSpan.Zero, (sum, s) => sum + s.Duration);
}
