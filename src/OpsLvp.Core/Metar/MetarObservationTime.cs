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
    /// The instant this group means for a receiver whose clock reads <paramref name="now"/>: the latest instant with
    /// this day, hour and minute that is not later than <paramref name="now"/> + <paramref name="allowedSkew"/>
    /// (default 10 minutes), looking back at most two months. Months without the day (31 in a 30-day month) are passed
    /// over; any two consecutive months include one of 31 days, so there is always an answer.
    /// </summary>
    public DateTimeOffset ResolveNear(DateTimeOffset now, TimeSpan? allowedSkew = null)
    {
        var latest = now.ToUniversalTime() + (allowedSkew ?? TimeSpan.FromMinutes(10));
        var month = new DateTime(latest.Year, latest.Month, 1, 0, 0, 0, DateTimeKind.Utc);
        for (var back = 0; ; back++)
        {
            var m = month.AddMonths(-back);
            if (Day > DateTime.DaysInMonth(m.Year, m.Month))
            {
                continue;
            }
            var candidate = new DateTimeOffset(m.Year, m.Month, Day, Hour, Minute, 0, TimeSpan.Zero);
            if (candidate <= latest)
            {
                return candidate;
            }
        }
    }

    /// <inheritdoc />
    public override string ToString() => $"{Day:00}{Hour:00}{Minute:00}Z";
}
