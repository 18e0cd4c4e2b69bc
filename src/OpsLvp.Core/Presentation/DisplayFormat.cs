using System.Globalization;
using OpsLvp.Core.Reporting;

namespace OpsLvp.Core.Presentation;

/// <summary>
/// The one way screens and exports print durations, times and values with units. Invariant culture, 24-hour UTC
/// with a trailing Z (aviation practice, common practice), metres for RVR and visibility, feet for ceiling.
/// </summary>
public static class DisplayFormat
{
    /// <summary>
    /// A duration: "45 s", "4 min 20 s" ("4 min" on the minute), "1 h 05 min", "2 d 3 h"; whole units, rounded down; negative spans read
    /// as "0 s" (an age or a time-in-phase is never negative; a clock a hair behind the reading must not say "-1 s").
    /// </summary>
    public static string Duration(TimeSpan span)
    {
        if (span < TimeSpan.Zero)
        {
            span = TimeSpan.Zero;
        }
        var total = (long)Math.Floor(span.TotalSeconds);
        return total switch
        {
            < 60 => Inv($"{total} s"),
            < 3600 when total % 60 == 0 => Inv($"{total / 60} min"),
            < 3600 => Inv($"{total / 60} min {total % 60} s"),
            < 86_400 => Inv($"{total / 3600} h {total % 3600 / 60:00} min"),
            _ => Inv($"{total / 86_400} d {total % 86_400 / 3600} h"),
        };
    }

    /// <summary>A signed difference (review: a confirmation before its condition): <see cref="Duration"/> with "−" in front when negative.</summary>
    public static string SignedDuration(TimeSpan span) => span < TimeSpan.Zero ? "−" + Duration(span.Duration()) : Duration(span);

    /// <summary>"03:12Z".</summary>
    public static string UtcClock(DateTimeOffset t) => t.UtcDateTime.ToString("HH:mm'Z'", CultureInfo.InvariantCulture);

    /// <summary>"03:12:05Z".</summary>
    public static string UtcClockSeconds(DateTimeOffset t) => t.UtcDateTime.ToString("HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    /// <summary>"2026-12-01 03:12:05Z".</summary>
    public static string UtcDateTime(DateTimeOffset t) => t.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    /// <summary>"2026-12-01 03:12Z".</summary>
    public static string UtcDateMinutes(DateTimeOffset t) => t.UtcDateTime.ToString("yyyy-MM-dd HH:mm'Z'", CultureInfo.InvariantCulture);

    /// <summary>
    /// Local wall time "04:12:05" in the IANA or Windows zone <paramref name="timeZoneId"/>, or null when this
    /// machine does not know the zone (the caller says so rather than guessing).
    /// </summary>
    public static string? LocalClockSeconds(DateTimeOffset t, string timeZoneId)
    {
        try
        {
            var zone = TimeZoneInfo.FindSystemTimeZoneById(timeZoneId);
            return TimeZoneInfo.ConvertTime(t, zone).ToString("HH:mm:ss", CultureInfo.InvariantCulture);
        }
        catch (Exception ex) when (ex is TimeZoneNotFoundException or InvalidTimeZoneException or ArgumentException)
        {
            return null;
        }
    }

    /// <summary>A whole number, invariant: "550".</summary>
    public static string Number(double value) => value.ToString("0", CultureInfo.InvariantCulture);

    /// <summary>"550 m".</summary>
    public static string Metres(double metres) => Number(metres) + " m";

    /// <summary>"200 ft".</summary>
    public static string Feet(double feet) => Number(feet) + " ft";

    /// <summary>
    /// An RVR with its unit: "550 m"; above the reportable range "above 2000 m", below it "below 50 m" (ICAO Annex 3,
    /// App 3, §4.3.6: limits 50 m and 2000 m, inclusive, as <see cref="RvrReporting"/>). <paramref name="upperLimitM"/>
    /// replaces 2000 m where an aerodrome reports to another limit.
    /// </summary>
    public static string Rvr(double metres, double? upperLimitM = null) => RvrParts(metres, upperLimitM) switch
    {
        (null, var number) => number + " m",
        (var qualifier, var number) => $"{qualifier} {number} m",
    };

    /// <summary>The RVR figure without its unit for large displays: "550", "above 2000", "below 50".</summary>
    public static string RvrNumber(double metres, double? upperLimitM = null) => RvrParts(metres, upperLimitM) switch
    {
        (null, var number) => number,
        (var qualifier, var number) => $"{qualifier} {number}",
    };

    private static (string? Qualifier, string Number) RvrParts(double metres, double? upperLimitM)
    {
        var upper = upperLimitM ?? RvrReporting.UpperLimit.Value;
        return metres > upper ? ("above", Number(upper))
            : metres < RvrReporting.LowerLimit.Value ? ("below", Number(RvrReporting.LowerLimit.Value))
            : (null, Number(metres));
    }

    private static string Inv(FormattableString text) => text.ToString(CultureInfo.InvariantCulture);
}
