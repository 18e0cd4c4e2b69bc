using System.Globalization;
using System.Text.RegularExpressions;

namespace OpsLvp.Core.Engine.Replay;

/// <summary>RFC 4180 field splitting for one-record-per-line files, and the time format both replay files use.</summary>
internal static partial class Csv
{
    private static readonly Regex ExplicitOffset = OffsetRegex();

    /// <summary>
    /// The data rows of a file whose first line must be <paramref name="header"/> (a leading BOM and spaces
    /// allowed) and whose rows have exactly <paramref name="fieldCount"/> fields; errors name file and line.
    /// </summary>
    public static IEnumerable<CsvRow> Rows(string text, string fileName, string header, int fieldCount)
    {
        ArgumentNullException.ThrowIfNull(text);
        var seenHeader = false;
        foreach (var (number, line) in Lines(text))
        {
            FormatException Error(string what) => new($"{fileName} line {number}: {what}");
            if (!seenHeader)
            {
                if (line.Trim().TrimStart('\uFEFF') != header)
                {
                    throw Error($"header must be '{header}'");
                }
                seenHeader = true;
                continue;
            }
            var fields = Split(line, Error);
            if (fields.Count != fieldCount)
            {
                throw Error($"expected {fieldCount} fields, found {fields.Count}");
            }
            yield return new CsvRow(fileName, number, fields);
        }
        if (!seenHeader)
        {
            throw new FormatException($"{fileName}: empty file, header '{header}' missing");
        }
    }

    /// <summary>Splits a line into fields; quoted fields may hold commas and doubled quotes.</summary>
    public static List<string> Split(string line, Func<string, Exception> error)
    {
        var fields = new List<string>();
        var i = 0;
        while (true)
        {
            if (i < line.Length && line[i] == '"')
            {
                var sb = new System.Text.StringBuilder();
                i++;
                while (true)
                {
                    if (i >= line.Length)
                    {
                        throw error("unterminated quoted field");
                    }
                    if (line[i] == '"')
                    {
                        if (i + 1 < line.Length && line[i + 1] == '"')
                        {
                            sb.Append('"');
                            i += 2;
                            continue;
                        }
                        i++;
                        break;
                    }
                    sb.Append(line[i++]);
                }
                fields.Add(sb.ToString());
                if (i < line.Length && line[i] != ',')
                {
                    throw error("text after a closing quote");
                }
            }
            else
            {
                var comma = line.IndexOf(',', i);
                var end = comma < 0 ? line.Length : comma;
                var field = line[i..end];
                if (field.Contains('"'))
                {
                    throw error("quote inside an unquoted field");
                }
                fields.Add(field);
                i = end;
            }
            if (i >= line.Length)
            {
                return fields;
            }
            i++; // the comma
            if (i == line.Length)
            {
                fields.Add("");
                return fields;
            }
        }
    }

    /// <summary>ISO 8601 instant with an explicit offset or Z, e.g. 2026-12-01T03:12:00Z.</summary>
    public static bool TryTime(string text, out DateTimeOffset time)
    {
        text = text.Trim();
        time = default;
        return ExplicitOffset.IsMatch(text)
            && DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.AdjustToUniversal, out time);
    }

    /// <summary>Lines with their 1-based numbers, blank lines left out; the first non-blank line is the header.</summary>
    public static IEnumerable<(int Number, string Text)> Lines(string text) =>
        text.Replace("\r\n", "\n", StringComparison.Ordinal).Split('\n')
            .Select((line, i) => (Number: i + 1, Text: line.TrimEnd('\r')))
            .Where(x => x.Text.Trim().Length > 0);

    [GeneratedRegex(@"^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$", RegexOptions.IgnoreCase)]
    private static partial Regex OffsetRegex();
}
