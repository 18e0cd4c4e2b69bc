using System.Text.Json;

namespace OpsLvp.Core.Review;

/// <summary>
/// The capability marks of recorded events (docs/capability.md, docs/replay.md <c>capability_changed</c>): one per
/// changed runway direction, in event order. Read from the recorded event lines, so a review and a replayed export show
/// the same marks.
/// </summary>
public static class CapabilityTimeline
{
    /// <exception cref="FormatException">A capability_changed event without its directions, or a direction without its fields.</exception>
    public static IReadOnlyList<CapabilityMark> Marks(IEnumerable<RecordedEvent> events)
    {
        ArgumentNullException.ThrowIfNull(events);
        var marks = new List<CapabilityMark>();
        foreach (var e in events.Where(e => e.Name == "capability_changed").OrderBy(e => e.At))
        {
            using var doc = JsonDocument.Parse(e.Json);
            if (!doc.RootElement.TryGetProperty("directions", out var directions) || directions.ValueKind != JsonValueKind.Array)
            {
                throw new FormatException($"capability_changed at {e.At:O} has no 'directions' array");
            }
            foreach (var d in directions.EnumerateArray())
            {
                var direction = String(d, "direction", e.At) ?? throw new FormatException($"capability_changed at {e.At:O}: a direction has no 'direction'");
                var after = String(d, "after", e.At) ?? throw new FormatException($"capability_changed at {e.At:O}: {direction} has no 'after'");
                var inUse = d.TryGetProperty("in_use", out var u) && u.ValueKind == JsonValueKind.True;
                marks.Add(new CapabilityMark(e.At, direction, inUse, String(d, "before", e.At), after, NotAvailable(d)));
            }
        }
        return marks;
    }

    /// <summary>Per operation not available, in recorded (profile) order: "operation: first reason".</summary>
    private static List<string> NotAvailable(JsonElement direction)
    {
        var result = new List<string>();
        if (!direction.TryGetProperty("operations", out var ops) || ops.ValueKind != JsonValueKind.Array)
        {
            return result;
        }
        foreach (var op in ops.EnumerateArray())
        {
            if (op.TryGetProperty("available", out var a) && a.ValueKind == JsonValueKind.False
                && op.TryGetProperty("reasons", out var reasons) && reasons.ValueKind == JsonValueKind.Array && reasons.GetArrayLength() > 0)
            {
                result.Add($"{op.GetProperty("operation").GetString()}: {reasons[0].GetString()}");
            }
        }
        return result;
    }

    private static string? String(JsonElement element, string name, DateTimeOffset at) =>
        !element.TryGetProperty(name, out var v) || v.ValueKind == JsonValueKind.Null ? null
        : v.ValueKind == JsonValueKind.String ? v.GetString()
        : throw new FormatException($"capability_changed at {at:O}: '{name}' is not a string");
}
