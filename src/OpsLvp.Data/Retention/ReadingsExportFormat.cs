using System.Globalization;
using System.IO.Compression;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Audit.Anchors;

namespace OpsLvp.Data.Retention;

/// <summary>
/// The readings export file (docs/retention.md "Export files"): gzip of UTF-8 NDJSON. Line 1 is the header
/// <c>{"format":"opslvp.readings.export.v1","day":"yyyy-MM-dd"}</c>; every further line is one reading, in id order:
/// <c>{"id","received_at","source","sensor","kind","time","value","status","accepted","reject_reason","reject_detail"}</c>,
/// times as in the audit entry (UTC, seven fraction digits), <c>value</c> a JSON number that reads back to the stored
/// double, absent values <c>null</c>. Beside each file, <c>NAME.sha256</c> holds its SHA-256 in <c>sha256sum</c> form.
/// </summary>
public static class ReadingsExportFormat
{
    public const string FormatTag = "opslvp.readings.export.v1";

    public const string Extension = ".ndjson.gz";

    /// <summary><c>readings-2026-01-02-000000000101-000000000250.ndjson.gz</c>: receipt day (UTC), first and last id.</summary>
    public static string FileName(DateOnly day, long firstId, long lastId) =>
        string.Create(CultureInfo.InvariantCulture, $"readings-{day:yyyy-MM-dd}-{firstId:D12}-{lastId:D12}{Extension}");

    public static void WriteHeader(Utf8JsonWriter json, DateOnly day)
    {
        json.WriteStartObject();
        json.WriteString("format", FormatTag);
        json.WriteString("day", day.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture));
        json.WriteEndObject();
    }

    public static void Write(Utf8JsonWriter json, ExportedReading r)
    {
        json.WriteStartObject();
        json.WriteNumber("id", r.Id);
        json.WriteString("received_at", AuditCanonical.FormatTime(r.ReceivedAt));
        json.WriteString("source", r.Source);
        json.WriteString("sensor", r.Sensor);
        json.WriteString("kind", r.Kind);
        WriteOrNull(json, "time", r.Time is { } t ? AuditCanonical.FormatTime(t) : null);
        if (r.Value is { } v && double.IsFinite(v))
        {
            json.WriteNumber("value", v);
        }
        else if (r.Value is { } odd)
        {
            // not a JSON number: kept as its round-trip text so the digest reads back the same
            json.WriteString("value", odd.ToString("R", CultureInfo.InvariantCulture));
        }
        else
        {
            json.WriteNull("value");
        }
        WriteOrNull(json, "status", r.Status);
        json.WriteBoolean("accepted", r.Accepted);
        WriteOrNull(json, "reject_reason", r.RejectReason);
        WriteOrNull(json, "reject_detail", r.RejectDetail);
        json.WriteEndObject();
    }

    /// <summary>Reads an export file's readings in order; throws <see cref="InvalidDataException"/> naming the line when it is not this format.</summary>
    public static IEnumerable<ExportedReading> Read(string path)
    {
        using var file = File.OpenRead(path);
        using var gzip = new GZipStream(file, CompressionMode.Decompress);
        using var reader = new StreamReader(gzip, new UTF8Encoding(false, true));
        var header = reader.ReadLine();
        if (header is null || !IsHeader(header))
        {
            throw new InvalidDataException($"{Path.GetFileName(path)}: line 1 is not a {FormatTag} header");
        }
        var lineNumber = 1;
        string? line;
        while ((line = reader.ReadLine()) is not null)
        {
            lineNumber++;
            yield return Parse(line, Path.GetFileName(path), lineNumber);
        }
    }

    /// <summary>Lowercase hex SHA-256 of a file's bytes.</summary>
    public static string FileSha256(string path)
    {
        using var file = File.OpenRead(path);
        return Convert.ToHexStringLower(SHA256.HashData(file));
    }

    /// <summary>Count and covered-readings digest of a file's content, read back from disk.</summary>
    public static (long Count, long FirstId, long LastId, string ReadingsSha256) Digest(string path)
    {
        using var digest = new ReadingsDigest();
        long first = 0;
        foreach (var r in Read(path))
        {
            if (digest.Count == 0)
            {
                first = r.Id;
            }
            r.AddTo(digest);
        }
        return (digest.Count, first, digest.LastId, digest.Finish());
    }

    private static bool IsHeader(string line)
    {
        try
        {
            using var doc = JsonDocument.Parse(line);
            return doc.RootElement.ValueKind == JsonValueKind.Object
                && doc.RootElement.TryGetProperty("format", out var f) && f.ValueKind == JsonValueKind.String && f.GetString() == FormatTag;
        }
        catch (JsonException)
        {
            return false;
        }
    }

    private static ExportedReading Parse(string line, string name, int lineNumber)
    {
        try
        {
            using var doc = JsonDocument.Parse(line);
            var e = doc.RootElement;
            return new ExportedReading(
                e.GetProperty("id").GetInt64(),
                ParseTime(e.GetProperty("received_at").GetString()!),
                e.GetProperty("source").GetString()!,
                e.GetProperty("sensor").GetString()!,
                e.GetProperty("kind").GetString()!,
                e.GetProperty("time").GetString() is { } t ? ParseTime(t) : null,
                e.GetProperty("value").ValueKind switch
                {
                    JsonValueKind.Null => null,
                    JsonValueKind.String => double.Parse(e.GetProperty("value").GetString()!, NumberStyles.Float, CultureInfo.InvariantCulture),
                    _ => e.GetProperty("value").GetDouble(),
                },
                e.GetProperty("status").GetString(),
                e.GetProperty("accepted").GetBoolean(),
                e.GetProperty("reject_reason").GetString(),
                e.GetProperty("reject_detail").GetString());
        }
        catch (Exception ex) when (ex is JsonException or KeyNotFoundException or InvalidOperationException or FormatException)
        {
            throw new InvalidDataException($"{name}: line {lineNumber} is not an exported reading: {ex.Message}", ex);
        }
    }

    private static DateTimeOffset ParseTime(string text) =>
        DateTimeOffset.ParseExact(text, "yyyy-MM-dd'T'HH:mm:ss.fffffff'Z'", CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal);

    private static void WriteOrNull(Utf8JsonWriter json, string name, string? value)
    {
        if (value is null)
        {
            json.WriteNull(name);
        }
        else
        {
            json.WriteString(name, value);
        }
    }
}
