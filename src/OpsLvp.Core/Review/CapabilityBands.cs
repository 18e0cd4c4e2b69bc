using System.Text.Json;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Core.Review;

/// <summary>
/// Capability per runway direction over a review window (docs/capability.md "Review"), read from recorded
/// <c>capability_changed</c> events (docs/replay.md), so the review page, the exports and a replayed export or a
/// what-if show it alike: the state of each direction, its changes, and bands of consecutive segments.
/// </summary>
public static class CapabilityBands
{
    private const string EventName = "capability_changed";

    /// <summary>The states one <c>capability_changed</c> event records (only the directions that changed).</summary>
    /// <exception cref="FormatException">The event has no directions, or a direction lacks its fields.</exception>
    public static IReadOnlyList<CapabilityState> StatesOf(RecordedEvent e)
    {
        ArgumentNullException.ThrowIfNull(e);
        using var doc = JsonDocument.Parse(e.Json);
        if (!doc.RootElement.TryGetProperty("directions", out var directions) || directions.ValueKind != JsonValueKind.Array)
        {
            throw new FormatException($"{EventName} at {e.At:O} has no 'directions' array");
        }
        var result = new List<CapabilityState>();
        foreach (var d in directions.EnumerateArray())
        {
            var direction = d.TryGetProperty("direction", out var dv) && dv.ValueKind == JsonValueKind.String
                ? dv.GetString()!
                : throw new FormatException($"{EventName} at {e.At:O}: a direction has no 'direction'");
            if (!d.TryGetProperty("operations", out var ops) || ops.ValueKind != JsonValueKind.Array)
            {
                throw new FormatException($"{EventName} at {e.At:O}: {direction} has no 'operations' array");
            }
            var operations = new List<(OperationKind Kind, bool Available, string? Reason)>();
            foreach (var op in ops.EnumerateArray())
            {
                var name = op.TryGetProperty("operation", out var n) && n.ValueKind == JsonValueKind.String ? n.GetString()! : "";
                var kind = Enum.GetValues<OperationKind>().Where(k => CapabilityWords.Operation(k) == name).Select(k => (OperationKind?)k).FirstOrDefault()
                    ?? throw new FormatException($"{EventName} at {e.At:O}: {direction} has an unknown operation '{name}'");
                var available = op.TryGetProperty("available", out var a) && a.ValueKind == JsonValueKind.True;
                string? reason = op.TryGetProperty("reasons", out var r) && r.ValueKind == JsonValueKind.Array && r.GetArrayLength() > 0 ? r[0].GetString() : null;
                operations.Add((kind, available, reason));
            }
            var inUse = d.TryGetProperty("in_use", out var u) && u.ValueKind == JsonValueKind.True;
            result.Add(State(direction, inUse, operations));
        }
        return result;
    }

    /// <summary>The state of a direction from its operations, worded as <see cref="CapabilityWords"/> words the live capability.</summary>
    public static CapabilityState State(string direction, bool inUse, IReadOnlyList<(OperationKind Kind, bool Available, string? Reason)> operations)
    {
        ArgumentNullException.ThrowIfNull(operations);
        var best = operations.Where(o => o.Available && o.Kind != OperationKind.Lvto)
            .Select(o => (OperationKind?)o.Kind).OrderByDescending(CapabilityEvaluator.ApproachRank).FirstOrDefault();
        var lvto = operations.Where(o => o.Kind == OperationKind.Lvto).ToList();
        var lvtoWords = lvto.Count == 0 ? "" : lvto.Any(o => o.Available) ? "LVTO available" : "LVTO not available";
        var notAvailable = operations.Where(o => !o.Available)
            .OrderByDescending(o => o.Kind == OperationKind.Lvto ? 0 : CapabilityEvaluator.ApproachRank(o.Kind))
            .Select(o => o.Reason is { } r ? $"{CapabilityWords.Operation(o.Kind)}: {r}" : CapabilityWords.Operation(o.Kind))
            .ToList();
        return new CapabilityState(direction, inUse, CapabilityWords.BestApproach(best), lvtoWords, notAvailable);
    }

    /// <summary>
    /// The state of each direction after <paramref name="initial"/> and every <c>capability_changed</c> event before
    /// <paramref name="before"/>, in first-recorded order.
    /// </summary>
    public static IReadOnlyList<CapabilityState> StatesBefore(IReadOnlyList<CapabilityState> initial, IEnumerable<RecordedEvent> events, DateTimeOffset before)
    {
        ArgumentNullException.ThrowIfNull(initial);
        ArgumentNullException.ThrowIfNull(events);
        var states = initial.ToList();
        foreach (var e in events.Where(e => e.Name == EventName && e.At < before).OrderBy(e => e.At))
        {
            foreach (var s in StatesOf(e))
            {
                var i = states.FindIndex(x => x.Direction == s.Direction);
                if (i < 0)
                {
                    states.Add(s);
                }
                else
                {
                    states[i] = s;
                }
            }
        }
        return states;
    }

    /// <summary>
    /// Every change from <paramref name="from"/> to <paramref name="to"/> (inclusive): the recorded events in the
    /// window against the states known at its start (<paramref name="atStart"/>); a direction recorded again unchanged is no change.
    /// </summary>
    public static IReadOnlyList<CapabilityChange> Changes(IReadOnlyList<CapabilityState> atStart, IEnumerable<RecordedEvent> events, DateTimeOffset from, DateTimeOffset to)
    {
        ArgumentNullException.ThrowIfNull(atStart);
        ArgumentNullException.ThrowIfNull(events);
        var current = atStart.ToDictionary(s => s.Direction, StringComparer.Ordinal);
        var changes = new List<CapabilityChange>();
        foreach (var e in events.Where(e => e.Name == EventName && e.At >= from && e.At <= to).OrderBy(e => e.At))
        {
            foreach (var s in StatesOf(e))
            {
                var before = current.GetValueOrDefault(s.Direction);
                if (s.SameAs(before))
                {
                    continue;
                }
                changes.Add(new CapabilityChange(e.At, before, s));
                current[s.Direction] = s;
            }
        }
        return changes;
    }

    /// <summary>
    /// The bands from <paramref name="from"/> to <paramref name="to"/>: per direction (in use at the end first, then in
    /// first-recorded order) consecutive segments from the window start, or its first recorded state, to the end.
    /// </summary>
    public static IReadOnlyList<CapabilityBand> Of(IReadOnlyList<CapabilityState> atStart, IEnumerable<RecordedEvent> events, DateTimeOffset from, DateTimeOffset to)
    {
        ArgumentNullException.ThrowIfNull(atStart);
        ArgumentNullException.ThrowIfNull(events);
        if (to < from)
        {
            return [];
        }
        var order = atStart.Select(s => s.Direction).ToList();
        var open = atStart.ToDictionary(s => s.Direction, s => (Start: from, State: s), StringComparer.Ordinal);
        var segments = order.ToDictionary(d => d, _ => new List<CapabilitySegment>(), StringComparer.Ordinal);
        foreach (var c in Changes(atStart, events, from, to))
        {
            if (!segments.TryGetValue(c.Direction, out var list))
            {
                order.Add(c.Direction);
                segments[c.Direction] = list = [];
            }
            if (open.TryGetValue(c.Direction, out var o) && c.At > o.Start)
            {
                list.Add(new CapabilitySegment(o.Start, c.At, o.State));
            }
            open[c.Direction] = (c.At, c.After);
        }
        var bands = new List<CapabilityBand>();
        foreach (var direction in order)
        {
            var list = segments[direction];
            var last = open[direction];
            if (to > last.Start || list.Count == 0)
            {
                list.Add(new CapabilitySegment(last.Start, to, last.State));
            }
            bands.Add(new CapabilityBand(direction, last.State.InUse, list));
        }
        return bands.OrderByDescending(b => b.InUse).ToList(); // stable: first-recorded order within each group
    }
}
