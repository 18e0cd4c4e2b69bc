using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Review;

/// <summary>
/// The facility statuses and runway directions in use that people set before an export's first input and that still
/// stood then (docs/review.md "Episode export"): as action rows at that instant, so a replay of the export alone starts
/// from the same facility statuses and directions as the live engine, not from "all serviceable, default direction".
/// Observer RVR is not carried (docs/review.md "Limits").
/// </summary>
public static class CapabilityCarryOver
{
    /// <summary>Marks a carried row's reason: "(set 2026-12-01T21:10:00Z) circuit 3 tripped".</summary>
    public const string SetPrefix = "(set ";

    /// <summary>
    /// The rows at <paramref name="at"/>: per facility its last status before <paramref name="at"/> when not
    /// serviceable, per runway its last direction in use when not the profile's default. Refused commands recorded
    /// nothing, so they are not among the events.
    /// </summary>
    public static IReadOnlyList<ActionRow> Rows(IEnumerable<RecordedEvent> events, AerodromeProfile profile, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(events);
        ArgumentNullException.ThrowIfNull(profile);
        var facilities = new Dictionary<string, ActionRow>(StringComparer.Ordinal);
        var runways = new Dictionary<string, ActionRow>(StringComparer.Ordinal);
        var order = new List<string>();
        foreach (var e in events.Where(e => e.At < at && e.Name == "manual_action").OrderBy(e => e.At))
        {
            var action = e.Str("action");
            if (action is not ("facility" or "runway_in_use"))
            {
                continue;
            }
            var row = CapabilityRecordedCommands.Row(e.At, e.Str("actor") ?? "", action, e.Str("detail") ?? "", e.Str("reason") ?? "");
            var key = action + "\n" + row.Target;
            if (!order.Contains(key))
            {
                order.Add(key);
            }
            (action == "facility" ? facilities : runways)[row.Target] = row;
        }
        var result = new List<ActionRow>();
        foreach (var key in order)
        {
            var target = key[(key.IndexOf('\n', StringComparison.Ordinal) + 1)..];
            if (key.StartsWith("facility\n", StringComparison.Ordinal))
            {
                var row = facilities[target];
                if (!row.Value.StartsWith("serviceable", StringComparison.Ordinal))
                {
                    result.Add(Carried(row, at));
                }
            }
            else
            {
                var row = runways[target];
                var runway = profile.Runways.FirstOrDefault(r => r is not null && r.Id == row.Target);
                if (runway is { Directions.Count: > 0 } && EngineModel.DirectionInUse(runway) != row.Value)
                {
                    result.Add(Carried(row, at));
                }
            }
        }
        return result;
    }

    private static ActionRow Carried(ActionRow row, DateTimeOffset at) =>
        row with { Time = at, Reason = $"{SetPrefix}{ReviewCsv.Time(row.Time)}) {row.Reason}" };
}
