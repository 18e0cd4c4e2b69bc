using System.Globalization;
using System.Text.RegularExpressions;

namespace OpsLvp.Web.Feeds.Demo;

/// <summary>
/// Moves a demo forecast's times by the shift between the scenario's own times and the demo clock (docs/feeds.md
/// "Demo forecasts"): the issue or observation time (<c>DDHHMMZ</c>) by the shift to the minute, every day-hour group
/// (<c>DDHH/DDHH</c>, <c>FMDDHHMM</c>) by the shift rounded to the nearest whole hour, since a TAF states whole hours.
/// A group that is not a time is left as written.
/// </summary>
public static partial class DemoForecastShift
{
    /// <param name="text">The report as written in the scenario.</param>
    /// <param name="writtenAt">When the scenario has it received (places the day-hour groups in time).</param>
    /// <param name="shift">Demo clock minus scenario time.</param>
    public static string Shift(string text, DateTimeOffset writtenAt, TimeSpan shift)
    {
        ArgumentNullException.ThrowIfNull(text);
        if (shift == TimeSpan.Zero)
        {
            return text;
        }
        var hours = TimeSpan.FromHours(Math.Round(shift.TotalHours, MidpointRounding.AwayFromZero));
        var minutes = TimeSpan.FromMinutes(Math.Round(shift.TotalMinutes, MidpointRounding.AwayFromZero));
        text = IssueTime().Replace(text, m => Format(Place(m.Groups[1].Value, m.Groups[2].Value, m.Groups[3].Value, writtenAt) + minutes, "ddHHmm") + "Z");
        text = Window().Replace(text, m =>
            Format(Place(m.Groups[1].Value, m.Groups[2].Value, "00", writtenAt) + hours, "ddHH") + "/" +
            Format(Place(m.Groups[3].Value, m.Groups[4].Value, "00", writtenAt) + hours, "ddHH"));
        text = From().Replace(text, m => "FM" + Format(Place(m.Groups[1].Value, m.Groups[2].Value, m.Groups[3].Value, writtenAt) + hours, "ddHHmm"));
        return text;
    }

    /// <summary>The instant with this day, hour and minute nearest <paramref name="near"/> (previous, same or next month).</summary>
    private static DateTimeOffset Place(string day, string hour, string minute, DateTimeOffset near)
    {
        var d = int.Parse(day, CultureInfo.InvariantCulture);
        var h = int.Parse(hour, CultureInfo.InvariantCulture);
        var m = int.Parse(minute, CultureInfo.InvariantCulture);
        var month = new DateTimeOffset(near.Year, near.Month, 1, 0, 0, 0, TimeSpan.Zero);
        DateTimeOffset? best = null;
        for (var k = -1; k <= 1; k++)
        {
            var first = month.AddMonths(k);
            if (d < 1 || d > DateTime.DaysInMonth(first.Year, first.Month))
            {
                continue;
            }
            // DD24 is midnight at the end of day DD
            var candidate = first.AddDays(d - 1).AddHours(h).AddMinutes(m);
            if (best is null || (candidate - near).Duration() < (best.Value - near).Duration())
            {
                best = candidate;
            }
        }
        return best ?? near;
    }

    private static string Format(DateTimeOffset t, string format) => t.UtcDateTime.ToString(format, CultureInfo.InvariantCulture);

    [GeneratedRegex(@"\b(\d{2})(\d{2})(\d{2})Z\b")]
    private static partial Regex IssueTime();

    [GeneratedRegex(@"\b(\d{2})(\d{2})/(\d{2})(\d{2})\b")]
    private static partial Regex Window();

    [GeneratedRegex(@"\bFM(\d{2})(\d{2})(\d{2})\b")]
    private static partial Regex From();
}
