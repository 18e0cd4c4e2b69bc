using System.Text.Json;
using System.Text.Json.Nodes;

namespace OpsLvp.Core.Audit.Anchors;

/// <summary>
/// The readings an audit entry covers (docs/audit.md "Readings covered"): those with <see cref="After"/> &lt; id ≤
/// <see cref="To"/>, their count and <see cref="ReadingsDigest"/>. Carried in the entry's payload as the member
/// <see cref="Member"/> = <c>{"after","to","count","sha256"}</c>.
/// </summary>
public sealed record ReadingsCoverage(long After, long To, long Count, string Sha256)
{
    public const string Member = "readingsCovered";

    /// <summary>The payload with this coverage added as <see cref="Member"/> (the payload must be a JSON object).</summary>
    public string AddTo(string payloadJson)
    {
        var node = JsonNode.Parse(payloadJson) as JsonObject ?? throw new ArgumentException("payload is not a JSON object", nameof(payloadJson));
        node[Member] = new JsonObject
        {
            ["after"] = After,
            ["to"] = To,
            ["count"] = Count,
            ["sha256"] = Sha256,
        };
        return node.ToJsonString();
    }

    /// <summary>The coverage a payload carries; null when it has none or it is not well formed.</summary>
    public static ReadingsCoverage? From(string payloadJson)
    {
        try
        {
            using var doc = JsonDocument.Parse(payloadJson);
            if (doc.RootElement.ValueKind != JsonValueKind.Object || !doc.RootElement.TryGetProperty(Member, out var c) || c.ValueKind != JsonValueKind.Object)
            {
                return null;
            }
            return c.TryGetProperty("after", out var a) && a.TryGetInt64(out var after)
                && c.TryGetProperty("to", out var t) && t.TryGetInt64(out var to)
                && c.TryGetProperty("count", out var n) && n.TryGetInt64(out var count)
                && c.TryGetProperty("sha256", out var h) && h.ValueKind == JsonValueKind.String
                ? new ReadingsCoverage(after, to, count, h.GetString()!)
                : null;
        }
        catch (Exception ex) when (ex is JsonException or InvalidOperationException or FormatException)
        {
            return null;
        }
    }
}
