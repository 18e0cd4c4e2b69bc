using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
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

    /// <summary>
    /// The export's profile with <paramref name="replacement"/> in place of the operation of the same runway direction
    /// and kind (changed RVR minima, facilities needed, degraded facilities accepted, LVP needed; docs/capability.md
    /// "What-if"); validated like a loaded profile, so an unknown facility or a bad minimum is refused with its field.
    /// </summary>
    /// <exception cref="ProfileException">No capability section, no such operation, or the edited profile is not valid.</exception>
    public static AerodromeProfile WithOperation(AerodromeProfile profile, OperationConfig replacement)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(replacement);
        var capability = profile.Capability ?? throw new ProfileException("capability", "the profile has no capability section to change");
        var index = capability.Operations.ToList().FindIndex(o => o is not null && o.Direction == replacement.Direction && o.Kind == replacement.Kind);
        if (index < 0)
        {
            throw new ProfileException("capability.operations", $"{replacement.Direction} offers no {CapabilityWords.Operation(replacement.Kind)}");
        }
        var operations = capability.Operations.ToList();
        operations[index] = replacement;
        var edited = profile with
        {
            Capability = capability with { Operations = operations },
            Version = profile.Version.EndsWith("+what-if", StringComparison.Ordinal) ? profile.Version : profile.Version + "+what-if",
        };
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
        var capabilityFrom = export.Start < windowEnd ? export.Start : windowStart;
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
            Sum(altPhases))
        {
            // recorded capability against the alternative's, per runway direction over the episode (docs/capability.md
            // "What-if"): the lead-in is left out, its first minute is the replay's sensors warming up
            ActualCapability = export.CapabilityBandsRecorded(capabilityFrom, windowEnd),
            AlternativeCapability = CapabilityBands.Of(CapabilityBands.StatesBefore([], events, capabilityFrom), events, capabilityFrom, windowEnd),
        };
    }

    private static TimeSpan Sum(IEnumerable<PhaseSpan> spans) =>
        spans.Where(s => s.Phase == Phase.Active).Aggregate(TimeSpan.Zero, (sum, s) => sum + s.Duration);
}
