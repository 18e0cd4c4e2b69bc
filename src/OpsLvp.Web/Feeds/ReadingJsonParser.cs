using System.Globalization;
using System.Text.Json;
using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Reads OpsLvp's JSON readings document (docs/feeds.md): <c>{ "readings": [ { "time", "sensor", "kind",
/// "value", "status" } ] }</c>. A document of the wrong shape throws <see cref="FeedFormatException"/>;
/// a bad item becomes a <see cref="RejectReason.Malformed"/> rejection and the other items still pass.
/// </summary>
public static class ReadingJsonParser
{
    /// <summary>Most items accepted in one document.</summary>
    public const int MaxItems = 10_000;

    private static readonly JsonDocumentOptions s_options = new() { MaxDepth = 16, CommentHandling = JsonCommentHandling.Disallow };

    public static ReadingParseResult Parse(ReadOnlyMemory<byte> utf8Json)
    {
        JsonDocument document;
        try
        {
            document = JsonDocument.Parse(utf8Json, s_options);
        }
        catch (JsonException ex)
        {
            throw new FeedFormatException($"body is not valid JSON: {ex.Message}", ex);
        }

        using (document)
        {
            var root = document.RootElement;
            if (root.ValueKind != JsonValueKind.Object)
            {
                throw new FeedFormatException($"body must be a JSON object with a \"readings\" array (got {Describe(root.ValueKind)})");
            }

            if (!root.TryGetProperty("readings", out var items) || items.ValueKind != JsonValueKind.Array)
            {
                throw new FeedFormatException("body must have a \"readings\" array");
            }

            var count = items.GetArrayLength();
            if (count > MaxItems)
            {
                throw new FeedFormatException(string.Create(CultureInfo.InvariantCulture, $"\"readings\" has {count} items; at most {MaxItems} are accepted per document"));
            }

            var readings = new List<Reading>(count);
            var rejections = new List<ReadingRejection>();
            var index = 0;
            foreach (var item in items.EnumerateArray())
            {
                if (TryRead(item, out var reading, out var detail, out var sensor))
                {
                    readings.Add(reading);
                }
                else
                {
                    rejections.Add(new ReadingRejection(index, RejectReason.Malformed, detail, sensor));
                }

                index++;
            }

            return new ReadingParseResult(readings, rejections);
        }
    }

    private static bool TryRead(JsonElement item, out Reading reading, out string detail, out string? sensorId)
    {
        reading = null!;
        sensorId = null;
        if (item.ValueKind != JsonValueKind.Object)
        {
            detail = $"item must be an object (got {Describe(item.ValueKind)})";
            return false;
        }

        var errors = new List<string>(1);
        var timeText = StringField(item, "time", errors);
        var sensorText = StringField(item, "sensor", errors);
        var kindText = StringField(item, "kind", errors);
        var statusText = StringField(item, "status", errors);

        DateTimeOffset time = default;
        ReadingKind kind = default;
        ReadingStatus status = default;
        if (timeText is not null)
        {
            Add(errors, ReadingFields.Time(timeText, out time));
        }

        if (sensorText is not null)
        {
            var sensorError = ReadingFields.Sensor(sensorText);
            Add(errors, sensorError);
            sensorId = sensorError is null ? sensorText : null;
        }

        if (kindText is not null)
        {
            Add(errors, ReadingFields.Kind(kindText, out kind));
        }

        if (statusText is not null)
        {
            Add(errors, ReadingFields.Status(statusText, out status));
        }

        double value = 0;
        if (!item.TryGetProperty("value", out var valueElement) || valueElement.ValueKind == JsonValueKind.Null)
        {
            errors.Add("value is missing");
        }
        else if (valueElement.ValueKind != JsonValueKind.Number)
        {
            errors.Add($"value must be a number (got {Describe(valueElement.ValueKind)})");
        }
        else if (!valueElement.TryGetDouble(out value))
        {
            errors.Add("value is not a representable number");
        }
        else
        {
            Add(errors, ReadingFields.Value(value));
        }

        if (errors.Count > 0)
        {
            detail = string.Join("; ", errors);
            return false;
        }

        reading = new Reading(time, sensorText!, kind, value, status);
        detail = "";
        return true;
    }

    private static string? StringField(JsonElement item, string name, List<string> errors)
    {
        if (!item.TryGetProperty(name, out var element) || element.ValueKind == JsonValueKind.Null)
        {
            errors.Add($"{name} is missing");
            return null;
        }

        if (element.ValueKind != JsonValueKind.String)
        {
            errors.Add($"{name} must be a string (got {Describe(element.ValueKind)})");
            return null;
        }

        return element.GetString();
    }

    private static void Add(List<string> errors, string? error)
    {
        if (error is not null)
        {
            errors.Add(error);
        }
    }

    private static string Describe(JsonValueKind kind) => kind switch
    {
        JsonValueKind.Object => "an object",
        JsonValueKind.Array => "an array",
        JsonValueKind.String => "a string",
        JsonValueKind.Number => "a number",
        JsonValueKind.True or JsonValueKind.False => "a boolean",
        JsonValueKind.Null => "null",
        _ => "nothing",
    };
}
