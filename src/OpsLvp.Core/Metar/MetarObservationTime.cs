namespace OpsLvp.Core.Metar;

/// <summary>
/// The <c>YYGGggZ</c> group: day of month, hour and minute UTC (WMO-No. 306 FM 15). Day 1–31, hour 0–23,
/// minute 0–59, checked on construction.
/// </summary>
public readonly record struct MetarObservationTime
{
    public MetarObservationTime(int day, int hour, int minute)
    {
        if (day is < 1 or > 31)
        {
            throw new ArgumentOutOfRangeException(nameof(day), day, "day of month must be 01 to 31");
        }
        if (hour is < 0 or > 23)
        {
            throw new ArgumentOutOfRangeException(nameof(hour), hour, "hour must be 00 to 23");
        }
        if (minute is < 0 or > 59)
        {
            throw new ArgumentOutOfRangeException(nameof(minute), minute, "minute must be 00 to 59");
        }
        Day = day;
        Hour = hour;
        Minute = minute;
    }

    public int Day { get; }

    public int Hour { get; }

    public int Minute { get; }

    /// <summary>
    /// The instant this group most probably means, given the receiver's clock: the candidate in the month of
    /// <paramref name="now"/>, the month before or the month after that lies closest to <paramref name="now"/>.
    /// Months without the day (e.g. 31 in a 30-day month) give no candidate.
    /// </summary>
    public DateTimeOffset ResolveNear(DateTimeOffset now)
    {
        var utc = now.ToUniversalTime();
        var month = new DateTime(utc.Year, utc.Month, 1, 0, 0, 0, DateTimeKind.Utc);
        DateTimeOffset? best = null;
        foreach (var offset in new[] { -1, 0, 1 })
        {
            var m = month.AddMonths(offset);
            if (Day > DateTime.DaysInMonth(m.Year, m.Month))
            {
                continue;
            }
            var candidate = new DateTimeOffset(m.Year, m.Month, Day, Hour, Minute, 0, TimeSpan.Zero);
            if (best is null || (candidate - utc).Duration() < (best.Value - utc).Duration())
            {
                best = candidate;
            }
        }
        // Every run of three consecutive months contains at least one month of 31 days, so a candidate exists.
        return best!.Value;
    }

    /// <inheritdoc />
    public override string ToString() => $"{Day:00}{Hour:00}{Minute:00}Z";
}
