using System.Globalization;
using System.Text.Json;
using System.Text.Unicode;
using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Reads OpsLvp's JSON readings document (docs/feeds.md): <c>{ "readings": [ { "time", "sensor", "kind",
/// "value", "status" } ] }</c>. A document of the wrong shape throws <see cref="FeedFormatException"/>;
/// a bad item becomes a <see cref="RejectReason.Malformed"/> rejection and the other items still pass.
/// Hostile input (docs/feeds.md "What ingest refuses"): a body that is not valid UTF-8 and a name given twice in the
/// document object are document errors; a name given twice in an item rejects that item (never "the last one wins").
/// </summary>
public static class ReadingJsonParser
{
    /// <summary>Most items accepted in one document.</summary>
    public const int MaxItems = 10_000;

    private static readonly JsonDocumentOptions s_options = new() { MaxDepth = 16, CommentHandling = JsonCommentHandling.Disallow };

    /// <summary>Parses a document of at most <see cref="MaxItems"/> items.</summary>
    public static ReadingParseResult Parse(ReadOnlyMemory<byte> utf8Json) => Parse(utf8Json, MaxItems);

    /// <summary>Parses a document; more than <paramref name="maxItems"/> items throws <see cref="FeedItemLimitException"/>.</summary>
    public static ReadingParseResult Parse(ReadOnlyMemory<byte> utf8Json, int maxItems)
    {
        // JsonDocument does not check the bytes inside strings; GetString() would throw later on a bad sequence.
        if (!Utf8.IsValid(utf8Json.Span))
        {
            throw new FeedFormatException(string.Create(CultureInfo.InvariantCulture, $"body is not valid UTF-8 (first bad byte at offset {FirstInvalidUtf8(utf8Json.Span)})"));
        }

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

            string? duplicate;
            try
            {
                duplicate = FirstDuplicateName(root);
            }
            catch (InvalidOperationException)
            {
                // GetString and Name throw on an escaped lone surrogate ("\ud800"): not text, so not a name
                throw new FeedFormatException(NotUnicode("body has a name"));
            }

            if (duplicate is not null)
            {
                throw new FeedFormatException($"body names \"{ReadingFields.Clip(duplicate)}\" more than once");
            }

            if (!root.TryGetProperty("readings", out var items) || items.ValueKind != JsonValueKind.Array)
            {
                throw new FeedFormatException("body must have a \"readings\" array");
            }

            var count = items.GetArrayLength();
            if (count > maxItems)
            {
                throw new FeedItemLimitException(string.Create(CultureInfo.InvariantCulture, $"\"readings\" has {count} items; at most {maxItems} are accepted per document"));
            }

            var readings = new List<Reading>(count);
            var indexes = new List<int>(count);
            var rejections = new List<ReadingRejection>();
            var index = 0;
            foreach (var item in items.EnumerateArray())
            {
                if (TryRead(item, out var reading, out var detail, out var sensor))
                {
                    readings.Add(reading);
                    indexes.Add(index);
                }
                else
                {
                    rejections.Add(new ReadingRejection(index, RejectReason.Malformed, detail, sensor));
                }

                index++;
            }

            return new ReadingParseResult(readings, rejections) { Indexes = indexes };
        }
    }

    /// <summary>
    /// One item; an escaped lone surrogate (<c>"\ud800"</c>) in any of its names or strings rejects the item instead of
    /// escaping as an exception (the fault suite's <c>lone-surrogate</c> case answered 500, docs/reliability.md "Fault runs").
    /// </summary>
    private static bool TryRead(JsonElement item, out Reading reading, out string detail, out string? sensorId)
    {
        try
        {
            return TryReadItem(item, out reading, out detail, out sensorId);
        }
        catch (InvalidOperationException)
        {
            reading = null!;
            sensorId = null;
            detail = NotUnicode("item has a name or a string");
            return false;
        }
    }

    private static string NotUnicode(string what) => $"{what} that is not valid Unicode text (an unpaired surrogate escape such as \\ud800)";

    private static bool TryReadItem(JsonElement item, out Reading reading, out string detail, out string? sensorId)
    {
        reading = null!;
        sensorId = null;
        if (item.ValueKind != JsonValueKind.Object)
        {
            detail = $"item must be an object (got {Describe(item.ValueKind)})";
            return false;
        }

        if (FirstDuplicateName(item) is { } duplicate)
        {
            sensorId = null;
            detail = $"field \"{ReadingFields.Clip(duplicate)}\" is given more than once";
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

    /// <summary>The first property name an object gives twice (compared after unescaping), or null.</summary>
    private static string? FirstDuplicateName(JsonElement obj)
    {
        HashSet<string>? seen = null;
        foreach (var property in obj.EnumerateObject())
        {
            seen ??= new HashSet<string>(StringComparer.Ordinal);
            if (!seen.Add(property.Name))
            {
                return property.Name;
            }
        }

        return null;
    }

    private static int FirstInvalidUtf8(ReadOnlySpan<byte> bytes)
    {
        var offset = 0;
        while (offset < bytes.Length)
        {
            var status = System.Text.Rune.DecodeFromUtf8(bytes[offset..], out _, out var consumed);
            if (status != System.Buffers.OperationStatus.Done)
            {
                return offset;
            }

            offset += consumed;
        }

        return offset;
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
