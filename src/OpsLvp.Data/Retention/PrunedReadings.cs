using System.Text.Json;
using System.Text.Json.Nodes;
using OpsLvp.Core.Audit;

namespace OpsLvp.Data.Retention;

/// <summary>
/// What one pruning run removed from the <c>readings</c> table, as its audit entry (kind <see cref="Kind"/>) records it
/// (docs/retention.md): every reading with <see cref="After"/> &lt; id ≤ <see cref="To"/>, <see cref="Count"/> of
/// them, received before <see cref="Cutoff"/>, exported to <see cref="Files"/>.
/// </summary>
public sealed record PrunedReadings(long After, long To, long Count, DateTimeOffset Cutoff, IReadOnlyList<ExportedReadingsFile> Files)
{
    public const string Kind = "readings.pruned";

    public const string Actor = "retention";

    public bool Overlaps(long after, long to) => after < To && to > After;

    public bool Holds(long id) => id > After && id <= To;

    public string ToPayloadJson()
    {
        var files = new JsonArray();
        foreach (var f in Files)
        {
            files.Add(new JsonObject
            {
                ["name"] = f.Name,
                ["count"] = f.Count,
                ["firstId"] = f.FirstId,
                ["lastId"] = f.LastId,
                ["sha256"] = f.Sha256,
                ["readingsSha256"] = f.ReadingsSha256,
            });
        }
        return new JsonObject
        {
            ["after"] = After,
            ["to"] = To,
            ["count"] = Count,
            ["cutoff"] = AuditCanonical.FormatTime(Cutoff),
            ["format"] = ReadingsExportFormat.FormatTag,
            ["files"] = files,
        }.ToJsonString();
    }

    /// <summary>The run a payload records; null when it is not well formed.</summary>
    public static PrunedReadings? From(string payloadJson)
    {
        try
        {
            using var doc = JsonDocument.Parse(payloadJson);
            var e = doc.RootElement;
            var files = new List<ExportedReadingsFile>();
            foreach (var f in e.GetProperty("files").EnumerateArray())
            {
                files.Add(new ExportedReadingsFile(
                    f.GetProperty("name").GetString()!, f.GetProperty("count").GetInt64(), f.GetProperty("firstId").GetInt64(),
                    f.GetProperty("lastId").GetInt64(), f.GetProperty("sha256").GetString()!, f.GetProperty("readingsSha256").GetString()!));
            }
            return new PrunedReadings(e.GetProperty("after").GetInt64(), e.GetProperty("to").GetInt64(), e.GetProperty("count").GetInt64(),
                e.GetProperty("cutoff").GetDateTimeOffset(), files);
        }
        catch (Exception ex) when (ex is JsonException or KeyNotFoundException or InvalidOperationException or FormatException or NullReferenceException)
        {
            return null;
        }
    }
}
