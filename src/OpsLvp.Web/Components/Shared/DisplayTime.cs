using System.Globalization;

namespace OpsLvp.Web.Components.Shared;

/// <summary>UTC times and durations as screens show them ("03:12Z", "4 min 20 s").</summary>
public static class DisplayTime
{
    /// <summary>Hours and minutes UTC with Z, e.g. "03:12Z".</summary>
    public static string Clock(DateTimeOffset t) => t.UtcDateTime.ToString("HH:mm'Z'", CultureInfo.InvariantCulture);

    /// <summary>Hours, minutes and seconds UTC with Z, e.g. "03:12:05Z".</summary>
    public static string ClockSeconds(DateTimeOffset t) => t.UtcDateTime.ToString("HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    /// <summary>"45 s", "4 min 20 s", "1 h 05 min"; negative spans read as zero.</summary>
    public static string Span(TimeSpan span)
    {
        if (span < TimeSpan.Zero)
        {
            span = TimeSpan.Zero;
        }
        var total = (long)Math.Floor(span.TotalSeconds);
        if (total < 60)
        {
            return string.Create(CultureInfo.InvariantCulture, $"{total} s");
        }
        if (total < 3600)
        {
            return string.Create(CultureInfo.InvariantCulture, $"{total / 60} min {total % 60} s");
        }
        return string.Create(CultureInfo.InvariantCulture, $"{total / 3600} h {total % 3600 / 60:00} min");
    }
}
