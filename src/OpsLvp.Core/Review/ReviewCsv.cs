using System.Globalization;
using System.Text;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Review;

/// <summary>
/// CSV exports of an episode (RFC 4180 quoting, "\n" line ends, UTC times with Z). Readings use the replay
/// readings format (docs/replay.md), so the file can be fed to <c>opslvp replay --readings</c>; audit entries are
/// <c>sequence,time,actor,kind,payload_json,previous_hash,hash</c> with the payload exactly as stored.
/// </summary>
public static class ReviewCsv
{
    public const string AuditHeader = "sequence,time,actor,kind,payload_json,previous_hash,hash";

    public static string Readings(IEnumerable<Reading> readings)
    {
        ArgumentNullException.ThrowIfNull(readings);
        var sb = new StringBuilder(ReadingsCsv.Header).Append('\n');
        foreach (var r in readings)
        {
            sb.Append(Time(r.Time)).Append(',')
                .Append(Field(r.SensorId)).Append(',')
                .Append(ReadingsCsv.KindName(r.Kind)).Append(',')
                .Append(r.Value.ToString("R", CultureInfo.InvariantCulture)).Append(',')
                .Append(r.Status.ToString().ToLowerInvariant()).Append('\n');
        }
        return sb.ToString();
    }

    public static string Audit(IEnumerable<AuditEntry> entries)
    {
        ArgumentNullException.ThrowIfNull(entries);
        var sb = new StringBuilder(AuditHeader).Append('\n');
        foreach (var e in entries)
        {
            sb.Append(e.Sequence.ToString(CultureInfo.InvariantCulture)).Append(',')
                .Append(AuditCanonical.FormatTime(e.Time)).Append(',')
                .Append(Field(e.Actor)).Append(',')
                .Append(Field(e.Kind)).Append(',')
                .Append(Field(e.PayloadJson)).Append(',')
                .Append(e.PreviousHash).Append(',')
                .Append(e.Hash).Append('\n');
        }
        return sb.ToString();
    }

    /// <summary>A UTC time as in the replay files.</summary>
    public static string Time(DateTimeOffset t) =>
        t.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss.FFFFFFF'Z'", CultureInfo.InvariantCulture);

    /// <summary>A field quoted when it holds a comma, quote or line break (quotes doubled).</summary>
    public static string Field(string value)
    {
        ArgumentNullException.ThrowIfNull(value);
        return value.AsSpan().IndexOfAny(",\"\r\n") >= 0 ? "\"" + value.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"" : value;
    }
}
