namespace OpsLvp.Core.Forecast;

/// <summary>
/// A time in a forecast: day of month (TAF <c>DDHH</c>, <c>DDHHMM</c>; null in a TREND's <c>FM</c>/<c>TL</c>/<c>AT</c>
/// <c>hhmm</c>), hour and minute UTC. Hour 24 with minute 0 is allowed: it is the end of that day (WMO-No. 306 FM 51
/// writes a period ending at midnight as <c>DD24</c> — from memory).
/// </summary>
public readonly record struct ForecastTime
{
    public ForecastTime(int? day, int hour, int minute)
    {
        if (day is < 1 or > 31)
        {
            throw new ArgumentOutOfRangeException(nameof(day), day, "day of month must be 01 to 31");
        }
        if (hour is < 0 or > 24 || (hour == 24 && minute != 0))
        {
            throw new ArgumentOutOfRangeException(nameof(hour), hour, "hour must be 00 to 23, or 24 with minute 00");
        }
        if (minute is < 0 or > 59)
        {
            throw new ArgumentOutOfRangeException(nameof(minute), minute, "minute must be 00 to 59");
        }
        Day = day;
        Hour = hour;
        Minute = minute;
    }

    public int? Day { get; }

    public int Hour { get; }

    public int Minute { get; }

    /// <summary>
    /// The instant nearest to <paramref name="anchor"/> with this day (of the anchor's month, the one before or the one
    /// after), hour and minute. Without a day: the first instant with this hour and minute at or after
    /// <paramref name="anchor"/>.
    /// </summary>
    public DateTimeOffset ResolveNear(DateTimeOffset anchor)
    {
        anchor = anchor.ToUniversalTime();
        var timeOfDay = TimeSpan.FromHours(Hour) + TimeSpan.FromMinutes(Minute);
        if (Day is not { } day)
        {
            var wholeMinute = new DateTimeOffset(anchor.Year, anchor.Month, anchor.Day, anchor.Hour, anchor.Minute, 0, TimeSpan.Zero);
            var candidate = new DateTimeOffset(anchor.Date, TimeSpan.Zero) + timeOfDay;
            return candidate >= wholeMinute ? candidate : candidate.AddDays(1);
        }
        var month = new DateTime(anchor.Year, anchor.Month, 1, 0, 0, 0, DateTimeKind.Utc);
        DateTimeOffset? best = null;
        for (var offset = -1; offset <= 1; offset++)
        {
            var m = month.AddMonths(offset);
            if (day > DateTime.DaysInMonth(m.Year, m.Month))
            {
                continue;
            }
            var candidate = new DateTimeOffset(m.Year, m.Month, day, 0, 0, 0, TimeSpan.Zero) + timeOfDay;
            if (best is null || (candidate - anchor).Duration() < (best.Value - anchor).Duration())
            {
                best = candidate;
            }
        }
        return best!.Value;
    }

    /// <summary>The first instant with this day (if any), hour and minute at or after <paramref name="start"/>.</summary>
    public DateTimeOffset ResolveOnOrAfter(DateTimeOffset start)
    {
        start = start.ToUniversalTime();
        if (Day is null)
        {
            return ResolveNear(start);
        }
        var near = ResolveNear(start);
        if (near >= start)
        {
            return near;
        }
        var timeOfDay = TimeSpan.FromHours(Hour) + TimeSpan.FromMinutes(Minute);
        var month = new DateTime(start.Year, start.Month, 1, 0, 0, 0, DateTimeKind.Utc);
        for (var offset = 0; ; offset++)
        {
            var m = month.AddMonths(offset);
            if (Day.Value > DateTime.DaysInMonth(m.Year, m.Month))
            {
                continue;
            }
            var candidate = new DateTimeOffset(m.Year, m.Month, Day.Value, 0, 0, 0, TimeSpan.Zero) + timeOfDay;
            if (candidate >= start)
            {
                return candidate;
            }
        }
    }

    /// <summary><c>DDHHMM</c>, or <c>HHMM</c> without a day.</summary>
    public override string ToString() => Day is { } d ? $"{d:00}{Hour:00}{Minute:00}" : $"{Hour:00}{Minute:00}";
}
