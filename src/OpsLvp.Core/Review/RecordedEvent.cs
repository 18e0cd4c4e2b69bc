using System.Globalization;
using System.Text.Json;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;

namespace OpsLvp.Core.Review;

/// <summary>
/// One engine event as recorded: its name and instant and the event's JSON object in the
/// <see cref="EventJson"/> form (docs/replay.md). The review reads events in this form whether they come from a
/// replay, an episode export or the audit log, so one model serves all three.
/// </summary>
/// <param name="At">The event's instant (UTC).</param>
/// <param name="Name">The EventJson name, e.g. "transition", "item_ticked".</param>
/// <param name="Json">The whole event object as one line of JSON.</param>
/// <param name="Sequence">The audit entry it came from, when it came from the audit log.</param>
public sealed record RecordedEvent(DateTimeOffset At, string Name, string Json, long? Sequence = null)
{
    /// <summary>The event as recorded by a replay or live run.</summary>
    public static RecordedEvent FromEvent(EngineEvent e)
    {
        ArgumentNullException.ThrowIfNull(e);
        return new RecordedEvent(e.At, EventJson.Name(e), EventJson.ToLine(e));
    }

    /// <summary>
    /// Parses one EventJson line. Throws <see cref="FormatException"/> naming what is wrong when it is not a JSON
    /// object with string fields "event" and "time" (ISO 8601 UTC).
    /// </summary>
    public static RecordedEvent Parse(string json, long? sequence = null)
    {
        ArgumentNullException.ThrowIfNull(json);
        try
        {
            using var doc = JsonDocument.Parse(json);
            var root = doc.RootElement;
            if (root.ValueKind != JsonValueKind.Object)
            {
                throw new FormatException("event is not a JSON object");
            }
            var name = root.TryGetProperty("event", out var n) && n.ValueKind == JsonValueKind.String
                ? n.GetString()!
                : throw new FormatException("event has no string field 'event'");
            var time = root.TryGetProperty("time", out var t) && t.ValueKind == JsonValueKind.String
                ? ParseTime(t.GetString()!, "time")
                : throw new FormatException("event has no string field 'time'");
            return new RecordedEvent(time, name, json, sequence);
        }
        catch (JsonException ex)
        {
            throw new FormatException($"event is not valid JSON: {ex.Message}", ex);
        }
    }

    /// <summary>
    /// The engine event an audit entry records, when its payload is an EventJson object (fields "event" and
    /// "time"); null for entries that record something else (sign-in, profile change, feed state).
    /// </summary>
    public static RecordedEvent? FromAudit(AuditEntry entry)
    {
        ArgumentNullException.ThrowIfNull(entry);
        try
        {
            using var doc = JsonDocument.Parse(entry.PayloadJson);
            if (doc.RootElement.ValueKind != JsonValueKind.Object
                || !doc.RootElement.TryGetProperty("event", out var n) || n.ValueKind != JsonValueKind.String
                || !doc.RootElement.TryGetProperty("time", out var t) || t.ValueKind != JsonValueKind.String)
            {
                return null;
            }
        }
        catch (JsonException)
        {
            return null;
        }
        try
        {
            return Parse(entry.PayloadJson, entry.Sequence);
        }
        catch (FormatException)
        {
            return null;
        }
    }

    /// <summary>A string field, or null when absent or not a string.</summary>
    public string? Str(string field)
    {
        using var doc = JsonDocument.Parse(Json);
        return doc.RootElement.TryGetProperty(field, out var v) && v.ValueKind == JsonValueKind.String ? v.GetString() : null;
    }

    /// <summary>A number field, or null when absent or not a number.</summary>
    public double? Num(string field)
    {
        using var doc = JsonDocument.Parse(Json);
        return doc.RootElement.TryGetProperty(field, out var v) && v.ValueKind == JsonValueKind.Number ? v.GetDouble() : null;
    }

    /// <summary>A time field, or null when absent or not a time.</summary>
    public DateTimeOffset? TimeField(string field)
    {
        var s = Str(field);
        return s is not null && DateTimeOffset.TryParse(s, CultureInfo.InvariantCulture, DateTimeStyles.AdjustToUniversal, out var t) ? t : null;
    }

    /// <summary>A string array field, empty when absent.</summary>
    public IReadOnlyList<string> Strings(string field)
    {
        using var doc = JsonDocument.Parse(Json);
        return doc.RootElement.TryGetProperty(field, out var v) && v.ValueKind == JsonValueKind.Array
            ? v.EnumerateArray().Where(x => x.ValueKind == JsonValueKind.String).Select(x => x.GetString()!).ToList()
            : [];
    }

    /// <summary>A phase field ("normal", "preparation", ...), or null.</summary>
    public Phase? PhaseField(string field) =>
        Str(field) is { } s && Enum.TryParse<Phase>(s, ignoreCase: true, out var p) ? p : null;

    private static DateTimeOffset ParseTime(string s, string field) =>
        DateTimeOffset.TryParse(s, CultureInfo.InvariantCulture, DateTimeStyles.AdjustToUniversal, out var t) && s.EndsWith('Z')
            ? t
            : throw new FormatException($"event field '{field}' is not an ISO 8601 UTC time: '{s}'");
}
