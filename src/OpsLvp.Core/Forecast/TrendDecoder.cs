using System.Globalization;
using System.Text.RegularExpressions;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// Decodes the TREND of a METAR or SPECI (WMO-No. 306 FM 15) — the text <see cref="Metar.MetarReport.Trend"/> keeps —
/// into change groups: <c>NOSIG</c>, or one or more <c>BECMG</c>/<c>TEMPO</c> groups, each with optional
/// <c>FMhhmm</c>, <c>TLhhmm</c> and <c>AThhmm</c> times followed by the forecast elements.
/// </summary>
public static partial class TrendDecoder
{
    /// <summary>Decodes <paramref name="trend"/>; null or blank gives no change groups.</summary>
    /// <exception cref="ForecastFormatException">The text does not start with NOSIG, BECMG or TEMPO, or a time is out of range.</exception>
    public static TrendForecast Decode(string? trend)
    {
        if (string.IsNullOrWhiteSpace(trend))
        {
            return new TrendForecast("", [], []);
        }
        var groups = trend.ToUpperInvariant()
            .Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)
            .Select(g => g.TrimEnd('='))
            .Where(g => g.Length > 0)
            .TakeWhile(g => g != "RMK")
            .ToList();
        if (groups.Count == 0 || groups[0] is not ("NOSIG" or "BECMG" or "TEMPO"))
        {
            throw new ForecastFormatException($"'{groups.FirstOrDefault() ?? trend}' does not start a TREND: expected NOSIG, BECMG or TEMPO");
        }
        var unknown = new List<string>();
        var reader = new ConditionsReader(groups, unknown);
        var changes = new List<ForecastChange>();
        while (reader.Peek() is { } g)
        {
            var start = reader.Index;
            reader.Index++;
            if (g == "NOSIG")
            {
                changes.Add(new ForecastChange(ForecastChangeKind.NoSignificantChange, null, ForecastWindow.Unspecified, new ForecastConditions(), g));
                continue;
            }
            if (g is not ("BECMG" or "TEMPO"))
            {
                // PROBnn and FMddhhmm are TAF groups: not part of a TREND.
                unknown.Add(g);
                reader.Read();
                continue;
            }
            ForecastTime? from = null, until = null, at = null;
            while (reader.Peek() is { } t && TimeRegex().Match(t) is { Success: true } m)
            {
                var time = Time(Int(m.Groups[2].Value), Int(m.Groups[3].Value), t);
                switch (m.Groups[1].Value)
                {
                    case "FM":
                        from = time;
                        break;
                    case "TL":
                        until = time;
                        break;
                    default:
                        at = time;
                        break;
                }
                reader.Index++;
            }
            var conditions = reader.Read();
            changes.Add(new ForecastChange(
                g == "BECMG" ? ForecastChangeKind.Becoming : ForecastChangeKind.Temporary,
                null,
                new ForecastWindow(from, until, at),
                conditions,
                string.Join(' ', groups.Skip(start).Take(reader.Index - start))));
        }
        return new TrendForecast(string.Join(' ', groups), changes, unknown);
    }

    private static ForecastTime Time(int hour, int minute, string group)
    {
        if (hour > 24 || minute > 59 || (hour == 24 && minute != 0))
        {
            throw new ForecastFormatException($"time in '{group}' is out of range: hour 00-24, minute 00-59");
        }
        return new ForecastTime(null, hour, minute);
    }

    private static int Int(string digits) => int.Parse(digits, NumberStyles.None, CultureInfo.InvariantCulture);

    [GeneratedRegex(@"^(FM|TL|AT)([0-9]{2})([0-9]{2})$")]
    private static partial Regex TimeRegex();
}
