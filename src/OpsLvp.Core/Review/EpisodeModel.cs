using OpsLvp.Core.Engine;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Review;

/// <summary>
/// Builds episodes from recorded events (<see cref="RecordedEvent"/>, EventJson form) and the readings received:
/// an episode runs from an "episode_started" event to the matching "episode_ended" (or is still running).
/// Events and readings with start ≤ time ≤ end belong to it.
/// </summary>
public static class EpisodeModel
{
    /// <summary>All episodes in the events, in start order.</summary>
    /// <param name="now">End of the review for an episode still running (its last phase interval ends here).</param>
    public static IReadOnlyList<EpisodeSummary> Build(IReadOnlyList<RecordedEvent> events, IReadOnlyList<Reading> readings, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(events);
        ArgumentNullException.ThrowIfNull(readings);
        return Bounds(events).Select(b => Summarise(b.Id, b.Start, b.End, Within(events, b.Start, b.End), readings, now) with
        {
            ForecastLead = ForecastLead.Of(events, b.Start, b.End),
            ForecastsReceived = events.Count(e => e.Name == EpisodeExport.ForecastReceivedName && e.At >= b.Start && (b.End is null || e.At <= b.End)),
        }).ToList();
    }

    /// <summary>Every episode's id, start and end (null while it runs), in start order, from the events alone.</summary>
    /// <exception cref="FormatException">An episode_started event without an episode id.</exception>
    public static IReadOnlyList<(string Id, DateTimeOffset Start, DateTimeOffset? End)> Bounds(IReadOnlyList<RecordedEvent> events)
    {
        ArgumentNullException.ThrowIfNull(events);
        var result = new List<(string, DateTimeOffset, DateTimeOffset?)>();
        foreach (var started in events.Where(e => e.Name == "episode_started"))
        {
            var id = started.Str("episode") ?? throw new FormatException($"episode_started at {started.At:O} has no episode id");
            var ended = events.FirstOrDefault(e => e.Name == "episode_ended" && e.Str("episode") == id);
            result.Add((id, started.At, ended?.At));
        }
        return result;
    }

    /// <summary>The events with start ≤ time ≤ end (end null: to the last event).</summary>
    public static IReadOnlyList<RecordedEvent> Within(IReadOnlyList<RecordedEvent> events, DateTimeOffset start, DateTimeOffset? end) =>
        events.Where(e => e.At >= start && (end is null || e.At <= end)).ToList();

    /// <summary>The phase intervals the transitions describe from <paramref name="start"/> to <paramref name="end"/>.</summary>
    public static IReadOnlyList<PhaseSpan> Spans(IReadOnlyList<TransitionMark> transitions, DateTimeOffset start, DateTimeOffset end, Phase initial = Phase.Normal)
    {
        ArgumentNullException.ThrowIfNull(transitions);
        var spans = new List<PhaseSpan>();
        var phase = initial;
        var from = start;
        foreach (var t in transitions.Where(t => t.At >= start && t.At <= end).OrderBy(t => t.At))
        {
            if (t.At > from)
            {
                spans.Add(new PhaseSpan(phase, from, t.At));
            }
            phase = t.To;
            from = t.At;
        }
        if (end > from)
        {
            spans.Add(new PhaseSpan(phase, from, end));
        }
        return spans;
    }

    /// <summary>The transitions among the events, in order.</summary>
    public static IReadOnlyList<TransitionMark> Transitions(IEnumerable<RecordedEvent> events) =>
        events.Where(e => e.Name == "transition")
            .Select(e => new TransitionMark(
                e.At,
                e.PhaseField("from") ?? throw new FormatException($"transition at {e.At:O} has no 'from' phase"),
                e.PhaseField("to") ?? throw new FormatException($"transition at {e.At:O} has no 'to' phase"),
                e.Str("by") ?? "auto",
                e.Str("actor"),
                e.Str("reason") ?? "",
                e.TimeField("proposed_at")))
            .ToList();

    /// <summary>Whether a reading gives a ceiling value (cloud base or vertical visibility).</summary>
    public static bool IsCeiling(ReadingKind kind) => kind is ReadingKind.CloudBase or ReadingKind.VerticalVisibility;

    private static EpisodeSummary Summarise(string id, DateTimeOffset start, DateTimeOffset? end, IReadOnlyList<RecordedEvent> events, IReadOnlyList<Reading> readings, DateTimeOffset now)
    {
        var transitions = Transitions(events);
        var deepest = Phase.Normal;
        foreach (var t in transitions)
        {
            if (Severity(t.To) > Severity(deepest))
            {
                deepest = t.To;
            }
        }
        var inWindow = readings.Where(r => r.Status == ReadingStatus.Ok && r.Time >= start && (end is null || r.Time <= end)).ToList();
        var lowestRvr = inWindow.Where(r => r.Kind == ReadingKind.Rvr).OrderBy(r => r.Value).FirstOrDefault();
        var lowestCeiling = inWindow.Where(r => IsCeiling(r.Kind)).OrderBy(r => r.Value).FirstOrDefault();
        var spanEnd = end ?? (now > start ? now : start);
        return new EpisodeSummary(
            id,
            start,
            end,
            deepest,
            lowestRvr?.Value,
            lowestRvr?.SensorId,
            lowestCeiling?.Value,
            lowestCeiling?.SensorId,
            events.Count(e => e.Name == "alarm_raised"),
            transitions,
            events.Count(e => e.Name == "confirmation"),
            events.Count(e => e.Name == "manual_action"),
            events.Count(e => e.Name == "item_ticked"),
            Spans(transitions, start, spanEnd));
    }

    /// <summary>Severity for "deepest": cancellation withdraws measures, so it ranks below active and preparation.</summary>
    private static int Severity(Phase p) => p switch
    {
        Phase.Active => 3,
        Phase.Preparation => 2,
        Phase.Cancellation => 1,
        _ => 0,
    };
}
