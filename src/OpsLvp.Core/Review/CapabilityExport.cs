using System.Text;
using System.Text.Json;

namespace OpsLvp.Core.Review;

/// <summary>
/// Capability in the episode exports (docs/review.md "Episode export"): <c>capability_at_start</c> (each direction's
/// state just before the export's first instant) and <c>capability</c> (every change after it) in the JSON, and the
/// same as <c>/capability.csv</c>. The changes are derived from the export's events; only the start states are read back.
/// </summary>
public static class CapabilityExport
{
    public const string CsvHeader = "time,direction,in_use,kind,before_best,before_lvto,after_best,after_lvto,not_available";

    /// <summary>Writes both properties into the export object being written.</summary>
    public static void Write(Utf8JsonWriter w, EpisodeExport export)
    {
        ArgumentNullException.ThrowIfNull(w);
        ArgumentNullException.ThrowIfNull(export);
        w.WriteStartArray("capability_at_start");
        foreach (var s in export.CapabilityAtStart)
        {
            w.WriteStartObject();
            w.WriteString("direction", s.Direction);
            w.WriteBoolean("in_use", s.InUse);
            w.WriteString("best", s.Best);
            w.WriteString("lvto", s.Lvto);
            WriteList(w, "not_available", s.NotAvailable);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteStartArray("capability");
        foreach (var c in export.CapabilityChanges())
        {
            w.WriteStartObject();
            w.WriteString("time", ReviewCsv.Time(c.At));
            w.WriteString("direction", c.Direction);
            w.WriteBoolean("in_use", c.After.InUse);
            if (c.Before is { } b)
            {
                w.WriteString("before_best", b.Best);
                w.WriteString("before_lvto", b.Lvto);
            }
            else
            {
                w.WriteNull("before_best");
                w.WriteNull("before_lvto");
            }
            w.WriteString("after_best", c.After.Best);
            w.WriteString("after_lvto", c.After.Lvto);
            WriteList(w, "not_available", c.After.NotAvailable);
            w.WriteEndObject();
        }
        w.WriteEndArray();
    }

    /// <summary>The <c>capability_at_start</c> states; an export without them (written before they were added) has none.</summary>
    /// <exception cref="FormatException">A state lacks a field or has one of the wrong type.</exception>
    public static IReadOnlyList<CapabilityState> ReadAtStart(JsonElement root)
    {
        if (!root.TryGetProperty("capability_at_start", out var list) || list.ValueKind == JsonValueKind.Null)
        {
            return [];
        }
        if (list.ValueKind != JsonValueKind.Array)
        {
            throw new FormatException("'capability_at_start' must be an array");
        }
        return list.EnumerateArray().Select((s, i) =>
        {
            var at = $"capability_at_start[{i}]";
            var reasons = s.TryGetProperty("not_available", out var r) && r.ValueKind == JsonValueKind.Array
                ? r.EnumerateArray().Select(x => x.ValueKind == JsonValueKind.String ? x.GetString()! : throw new FormatException($"{at}: 'not_available' must hold strings")).ToList()
                : throw new FormatException($"{at}: 'not_available' must be an array");
            return new CapabilityState(Str(s, "direction", at), s.TryGetProperty("in_use", out var u) && u.ValueKind == JsonValueKind.True, Str(s, "best", at), Str(s, "lvto", at), reasons);
        }).ToList();
    }

    /// <summary>
    /// The capability CSV: first each direction's state at the export's first instant (kind <c>at_start</c>), then
    /// every change (kind <c>change</c>); not_available joined with "; ".
    /// </summary>
    public static string Csv(EpisodeExport export)
    {
        ArgumentNullException.ThrowIfNull(export);
        var sb = new StringBuilder(CsvHeader).Append('\n');
        foreach (var s in export.CapabilityAtStart)
        {
            Row(sb, export.From, s, "at_start", null);
        }
        foreach (var c in export.CapabilityChanges())
        {
            Row(sb, c.At, c.After, "change", c.Before);
        }
        return sb.ToString();
    }

    private static void Row(StringBuilder sb, DateTimeOffset at, CapabilityState s, string kind, CapabilityState? before) =>
        sb.Append(ReviewCsv.Time(at)).Append(',')
            .Append(ReviewCsv.Field(s.Direction)).Append(',')
            .Append(s.InUse ? "true" : "false").Append(',')
            .Append(kind).Append(',')
            .Append(ReviewCsv.Field(before?.Best ?? "")).Append(',')
            .Append(ReviewCsv.Field(before?.Lvto ?? "")).Append(',')
            .Append(ReviewCsv.Field(s.Best)).Append(',')
            .Append(ReviewCsv.Field(s.Lvto)).Append(',')
            .Append(ReviewCsv.Field(string.Join("; ", s.NotAvailable))).Append('\n');

    private static string Str(JsonElement e, string name, string at) =>
        e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.String ? v.GetString()! : throw new FormatException($"{at}: '{name}' must be a string");

    private static void WriteList(Utf8JsonWriter w, string name, IReadOnlyList<string> items)
    {
        w.WriteStartArray(name);
        foreach (var i in items)
        {
            w.WriteStringValue(i);
        }
        w.WriteEndArray();
    }
}
