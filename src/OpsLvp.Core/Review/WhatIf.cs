using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Review;

/// <summary>
/// What-if: the episode's recorded readings and commands replayed through the same <c>ReplayRunner</c> with an
/// edited copy of the profile, compared with the transitions actually recorded. Nothing is written anywhere; the
/// live profile is not touched (the edited copy is a new record).
/// </summary>
public static class WhatIf
{
    /// <summary>The export's profile with other thresholds and dwells; everything else stays the same.</summary>
    public static AerodromeProfile WithThresholds(AerodromeProfile profile, ThresholdSet thresholds)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(thresholds);
        var edited = profile with { Thresholds = thresholds, Version = profile.Version + "+what-if" };
        var result = ProfileValidator.Validate(edited);
        return result.IsValid ? edited : throw new ProfileException(result.Problems);
    }

    /// <summary>Runs the alternative and compares it with the recorded transitions.</summary>
    public static WhatIfResult Run(EpisodeExport export, AerodromeProfile alternative)
    {
        ArgumentNullException.ThrowIfNull(export);
        ArgumentNullException.ThrowIfNull(alternative);
        var replay = export.Replay(alternative);
        var events = replay.Events.Select(RecordedEvent.FromEvent).ToList();
        var starts = export.Readings.Select(r => r.Time).Concat(export.Actions.Select(a => a.Time)).ToList();
        var windowStart = starts.Count > 0 ? starts.Min() : export.Start;
        var windowEnd = export.ReplayUntil;
        var actual = EpisodeModel.Transitions(export.Events);
        var alt = EpisodeModel.Transitions(events);
        var actualPhases = EpisodeModel.Spans(actual, windowStart, windowEnd);
        var altPhases = EpisodeModel.Spans(alt, windowStart, windowEnd);
        return new WhatIfResult(
            windowStart,
            windowEnd,
            actual,
            alt,
            events,
            actualPhases,
            altPhases,
            Sum(actualPhases),
            Sum(altPhases));
    }

    private static TimeSpan Sum(IEnumerable<PhaseSpan> spans) =>
        spans.Where(s => s.Phase == Phase.Active).Aggregate(TimeSpan.Zero, (sum, s) => sum + s.Duration);
}
