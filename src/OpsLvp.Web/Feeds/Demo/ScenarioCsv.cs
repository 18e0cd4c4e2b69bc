using System.Globalization;
using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds.Demo;

/// <summary>
/// Reads the demo scenario CSVs (docs/feeds.md): readings <c>time,sensor,kind,value,status</c> and, optionally,
/// actions <c>time,actor,action,target,value,reason</c>. Blank lines and lines starting with <c>#</c> are skipped.
/// A wrong header throws <see cref="FeedFormatException"/>; a bad row is reported and skipped.
/// Offsets are measured from the earliest reading row (ISO-8601 style) or from <c>00:00:00</c> (offset style).
/// </summary>
public static class ScenarioCsv
{
    public static readonly string[] ReadingColumns = ["time", "sensor", "kind", "value", "status"];
    public static readonly string[] ActionColumns = ["time", "actor", "action", "target", "value", "reason"];

    public static Scenario Load(string readingsCsv, string? actionsCsv)
    {
        var rejections = new List<ReadingRejection>();
        var readingRows = new List<(Stamp Stamp, string Sensor, ReadingKind Kind, double Value, ReadingStatus Status)>();
        var row = 0;
        bool? absoluteStyle = null;
        foreach (var (lineNo, fields) in Rows(readingsCsv, ReadingColumns, "readings"))
        {
            var index = row++;
            if (fields is null || fields.Count != ReadingColumns.Length)
            {
                rejections.Add(new ReadingRejection(index, RejectReason.Malformed, Line(lineNo, $"expected {ReadingColumns.Length} fields ({string.Join(',', ReadingColumns)})")));
                continue;
            }

            var errors = new List<string>();
            var stamp = ParseStamp(fields[0], ref absoluteStyle, errors);
            Add(errors, ReadingFields.Sensor(fields[1]));
            Add(errors, ReadingFields.Kind(fields[2], out var kind));
            Add(errors, ReadingFields.Value(fields[3], out var value));
            Add(errors, ReadingFields.Status(fields[4], out var status));
            if (errors.Count > 0)
            {
                var sensor = ReadingFields.Sensor(fields[1]) is null ? fields[1] : null;
                rejections.Add(new ReadingRejection(index, RejectReason.Malformed, Line(lineNo, string.Join("; ", errors)), sensor));
                continue;
            }

            readingRows.Add((stamp, fields[1], kind, value, status));
        }

        var origin = absoluteStyle == true ? readingRows.Min(r => r.Stamp) : new Stamp(null, TimeSpan.Zero);
        var readings = readingRows
            .Select(r => new ScenarioReading(r.Stamp.OffsetFrom(origin), r.Sensor, r.Kind, r.Value, r.Status))
            .OrderBy(r => r.Offset)
            .ToList();

        var actions = new List<ScenarioAction>();
        var actionErrors = new List<string>();
        if (actionsCsv is not null)
        {
            foreach (var (lineNo, fields) in Rows(actionsCsv, ActionColumns, "actions"))
            {
                if (fields is null || fields.Count != ActionColumns.Length)
                {
                    actionErrors.Add(Line(lineNo, $"expected {ActionColumns.Length} fields ({string.Join(',', ActionColumns)})"));
                    continue;
                }

                var errors = new List<string>();
                var stamp = ParseStamp(fields[0], ref absoluteStyle, errors);
                // the target is the actions file's to ask for: confirm, cancel and the like have none (docs/replay.md)
                for (var i = 1; i <= 2; i++)
                {
                    if (fields[i].Length == 0)
                    {
                        errors.Add($"{ActionColumns[i]} is missing");
                    }
                }

                if (errors.Count == 0 && stamp.CompareTo(origin) < 0)
                {
                    errors.Add("time is before the first reading");
                }

                if (errors.Count > 0)
                {
                    actionErrors.Add(Line(lineNo, string.Join("; ", errors)));
                    continue;
                }

                actions.Add(new ScenarioAction(stamp.OffsetFrom(origin), fields[1], fields[2], fields[3], fields[4].Length == 0 ? null : fields[4], fields[5]));
            }
        }

        return new Scenario(readings, actions.OrderBy(a => a.Offset).ToList(), rejections, actionErrors) { Origin = origin.Absolute };
    }

    private static Stamp ParseStamp(string text, ref bool? absoluteStyle, List<string> errors)
    {
        var error = ScenarioTime.Parse(text, out var absolute, out var relative);
        if (error is not null)
        {
            errors.Add(error);
            return default;
        }

        var isAbsolute = absolute is not null;
        absoluteStyle ??= isAbsolute;
        if (absoluteStyle != isAbsolute)
        {
            errors.Add(absoluteStyle.Value
                ? "time is an offset but the scenario uses ISO-8601 times"
                : "time is ISO-8601 but the scenario uses offsets");
        }

        return new Stamp(absolute, relative);
    }

    private static IEnumerable<(int LineNo, List<string>? Fields)> Rows(string csv, string[] columns, string what)
    {
        using var reader = new StringReader(csv);
        var lineNo = 0;
        var headerSeen = false;
        while (reader.ReadLine() is { } line)
        {
            lineNo++;
            var trimmed = line.Trim();
            if (trimmed.Length == 0 || trimmed.StartsWith('#'))
            {
                continue;
            }

            if (!headerSeen)
            {
                var header = CsvLine.Split(trimmed);
                if (header is null || !header.Select(h => h.ToLowerInvariant()).SequenceEqual(columns))
                {
                    throw new FeedFormatException($"{what} CSV line {lineNo}: header must be '{string.Join(',', columns)}' (got '{ReadingFields.Clip(trimmed)}')");
                }

                headerSeen = true;
                continue;
            }

            yield return (lineNo, CsvLine.Split(line));
        }

        if (!headerSeen)
        {
            throw new FeedFormatException($"{what} CSV is empty: header '{string.Join(',', columns)}' expected");
        }
    }

    private static string Line(int lineNo, string detail) => string.Create(CultureInfo.InvariantCulture, $"line {lineNo}: {detail}");

    private static void Add(List<string> errors, string? error)
    {
        if (error is not null)
        {
            errors.Add(error);
        }
    }

    private readonly record struct Stamp(DateTimeOffset? Absolute, TimeSpan Relative) : IComparable<Stamp>
    {
        public TimeSpan OffsetFrom(Stamp origin) =>
            Absolute is { } a && origin.Absolute is { } o ? a - o : Relative - origin.Relative;

        public int CompareTo(Stamp other) => OffsetFrom(other).CompareTo(TimeSpan.Zero);
    }
}
