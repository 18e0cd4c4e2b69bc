using System.Globalization;
using System.Text.RegularExpressions;
using OpsLvp.Core.Metar;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// Decodes what low-visibility procedures need from a TAF (WMO-No. 306 FM 51): <c>[TAF] [AMD|COR] CCCC YYGGggZ
/// [NIL] Y1Y1G1G1/Y2Y2G2G2 [CNL]</c>, the base forecast, and every change group (<c>BECMG</c>, <c>TEMPO</c>,
/// <c>FMYYGGgg</c>, <c>PROB30</c>/<c>PROB40</c> alone or before <c>TEMPO</c>) with its window. Elements: prevailing
/// visibility in metres or statute miles, <c>CAVOK</c>, weather, <c>NSW</c>, cloud, vertical visibility, <c>NSC</c>/<c>SKC</c>.
/// Input is matched case-insensitively; a trailing <c>=</c> is ignored. Unknown groups are skipped and listed.
/// </summary>
public static partial class TafDecoder
{
    private const int MaxLength = 8192;

    /// <summary>Decodes <paramref name="text"/>.</summary>
    /// <exception cref="ForecastFormatException">
    /// The text is empty, too long, a METAR/SPECI, or lacks the location indicator, issue time or validity period, or
    /// a change group lacks its time window.
    /// </exception>
    public static TafReport Decode(string? text)
    {
        if (string.IsNullOrWhiteSpace(text))
        {
            throw new ForecastFormatException("empty forecast: expected a TAF such as 'TAF XDMO 010500Z 0106/0206 24005KT 9999 SCT030'");
        }
        if (text.Length > MaxLength)
        {
            throw new ForecastFormatException($"forecast too long ({text.Length} characters, at most {MaxLength})");
        }
        var groups = text.ToUpperInvariant()
            .Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)
            .Select(g => g.TrimEnd('='))
            .Where(g => g.Length > 0)
            .ToList();
        return new Parser(groups).Parse();
    }

    /// <summary>Decodes <paramref name="text"/>, or returns false with the reason in <paramref name="error"/>.</summary>
    public static bool TryDecode(string? text, out TafReport? report, out string? error)
    {
        try
        {
            report = Decode(text);
            error = null;
            return true;
        }
        catch (ForecastFormatException ex)
        {
            report = null;
            error = ex.Message;
            return false;
        }
    }

    [GeneratedRegex(@"^[A-Z][A-Z0-9]{3}$")]
    private static partial Regex StationRegex();

    [GeneratedRegex(@"^([0-9]{2})([0-9]{2})([0-9]{2})Z$")]
    private static partial Regex IssueTimeRegex();

    [GeneratedRegex(@"^([0-9]{2})([0-9]{2})/([0-9]{2})([0-9]{2})$")]
    private static partial Regex PeriodRegex();

    private sealed class Parser(List<string> groups)
    {
        private readonly List<string> _groups = groups;
        private readonly List<string> _unknown = [];

        public TafReport Parse()
        {
            var reader = new ConditionsReader(_groups, _unknown);
            var text = string.Join(' ', _groups);
            var first = reader.Peek();
            if (first is "METAR" or "SPECI")
            {
                throw new ForecastFormatException($"this is a {first}, not a TAF: decode it with 'opslvp metar decode'");
            }
            var sawTaf = false;
            if (first == "TAF")
            {
                sawTaf = true;
                reader.Index++;
            }
            var amended = false;
            var corrected = false;
            while (reader.Peek() is "AMD" or "COR")
            {
                amended |= reader.Peek() == "AMD";
                corrected |= reader.Peek() == "COR";
                reader.Index++;
            }

            var station = reader.Peek();
            if (station is null)
            {
                throw new ForecastFormatException("no location indicator: expected 4 letters (e.g. XDMO) after TAF");
            }
            if (!StationRegex().IsMatch(station))
            {
                throw new ForecastFormatException($"'{station}' is not a location indicator: expected 4 letters (e.g. XDMO){(sawTaf ? "" : " or TAF")}");
            }
            reader.Index++;

            var issue = ParseIssueTime(reader.Peek(), station);
            reader.Index++;

            if (reader.Peek() == "NIL")
            {
                reader.Index++;
                _unknown.AddRange(_groups.Skip(reader.Index));
                return new TafReport
                {
                    Text = text, Station = station, IssueTime = issue, Amended = amended, Corrected = corrected, Nil = true,
                    UnknownGroups = _unknown,
                };
            }

            var validity = reader.Peek() is { } p && PeriodRegex().Match(p) is { Success: true } m
                ? Period(m, p)
                : throw new ForecastFormatException(
                    $"{(reader.Peek() is { } found ? $"'{found}'" : "nothing")} after the issue time where the validity period was expected: "
                    + "expected DDHH/DDHH (e.g. 0106/0206); a METAR has no validity period");
            reader.Index++;

            if (reader.Peek() == "CNL")
            {
                reader.Index++;
                _unknown.AddRange(_groups.Skip(reader.Index));
                return new TafReport
                {
                    Text = text, Station = station, IssueTime = issue, Validity = validity, Amended = amended,
                    Corrected = corrected, Cancelled = true, UnknownGroups = _unknown,
                };
            }

            var baseForecast = reader.Read();
            var changes = new List<ForecastChange>();
            string? remarks = null;
            while (reader.Peek() is { } g)
            {
                if (g == "RMK")
                {
                    remarks = string.Join(' ', _groups.Skip(reader.Index + 1));
                    break;
                }
                var start = reader.Index;
                reader.Index++;
                ForecastChangeKind kind;
                int? probability = null;
                ForecastWindow window;
                Match fm;
                if ((fm = ConditionsReader.FromTimeRegex().Match(g)).Success)
                {
                    kind = ForecastChangeKind.From;
                    window = new ForecastWindow(Time(Int(fm.Groups[1].Value), Int(fm.Groups[2].Value), Int(fm.Groups[3].Value), g), null, null);
                }
                else if (g == "NOSIG")
                {
                    throw new ForecastFormatException("NOSIG belongs to the TREND of a METAR/SPECI, not to a TAF");
                }
                else
                {
                    if (ConditionsReader.ProbabilityRegex().Match(g) is { Success: true } prob)
                    {
                        probability = Int(prob.Groups[1].Value);
                        kind = ForecastChangeKind.Probability;
                        if (reader.Peek() == "TEMPO")
                        {
                            kind = ForecastChangeKind.Temporary;
                            reader.Index++;
                        }
                    }
                    else
                    {
                        kind = g == "BECMG" ? ForecastChangeKind.Becoming : ForecastChangeKind.Temporary;
                    }
                    var indicator = string.Join(' ', _groups.Skip(start).Take(reader.Index - start));
                    window = reader.Peek() is { } w && PeriodRegex().Match(w) is { Success: true } pm
                        ? Period(pm, w)
                        : throw new ForecastFormatException(
                            $"change group '{indicator}' has no time window: expected DDHH/DDHH after it, found {(reader.Peek() is { } n ? $"'{n}'" : "the end")}");
                    reader.Index++;
                }
                var conditions = reader.Read();
                changes.Add(new ForecastChange(kind, probability, window, conditions,
                    string.Join(' ', _groups.Skip(start).Take(reader.Index - start))));
            }

            return new TafReport
            {
                Text = text,
                Station = station,
                IssueTime = issue,
                Validity = validity,
                Amended = amended,
                Corrected = corrected,
                Base = baseForecast,
                Changes = changes,
                Remarks = remarks,
                UnknownGroups = _unknown,
            };
        }

        private static MetarObservationTime ParseIssueTime(string? group, string station)
        {
            if (group is null)
            {
                throw new ForecastFormatException($"no issue time after '{station}': expected day, hour and minute UTC as DDHHMMZ (e.g. 010500Z)");
            }
            var m = IssueTimeRegex().Match(group);
            if (!m.Success)
            {
                throw new ForecastFormatException($"'{group}' is not an issue time: expected DDHHMMZ after '{station}' (e.g. 010500Z)");
            }
            var (day, hour, minute) = (Int(m.Groups[1].Value), Int(m.Groups[2].Value), Int(m.Groups[3].Value));
            if (day is < 1 or > 31 || hour > 23 || minute > 59)
            {
                throw new ForecastFormatException($"issue time '{group}' is out of range: day 01-31, hour 00-23, minute 00-59");
            }
            return new MetarObservationTime(day, hour, minute);
        }

        private static ForecastWindow Period(Match m, string group) =>
            new(Time(Int(m.Groups[1].Value), Int(m.Groups[2].Value), 0, group),
                Time(Int(m.Groups[3].Value), Int(m.Groups[4].Value), 0, group), null);

        private static ForecastTime Time(int day, int hour, int minute, string group)
        {
            if (day is < 1 or > 31 || hour > 24 || minute > 59 || (hour == 24 && minute != 0))
            {
                throw new ForecastFormatException($"time in '{group}' is out of range: day 01-31, hour 00-24, minute 00-59");
            }
            return new ForecastTime(day, hour, minute);
        }

        private static int Int(string digits) => int.Parse(digits, NumberStyles.None, CultureInfo.InvariantCulture);
    }
}
