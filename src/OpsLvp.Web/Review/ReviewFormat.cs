using System.Globalization;

namespace OpsLvp.Web.Review;

/// <summary>Invariant formatting for the review pages (UTC with Z).</summary>
public static class ReviewFormat
{
    public static string Time(DateTimeOffset t) => t.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    public static string Clock(DateTimeOffset t) => t.UtcDateTime.ToString("HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    /// <summary>"3 h 01 min", "12 min 05 s", "40 s"; a minus sign when negative.</summary>
    public static string Span(TimeSpan span)
    {
        var sign = span < TimeSpan.Zero ? "−" : "";
        var s = span.Duration();
        return sign + (s.TotalHours >= 1
            ? string.Create(CultureInfo.InvariantCulture, $"{(int)s.TotalHours} h {s.Minutes:00} min")
            : s.TotalMinutes >= 1
                ? string.Create(CultureInfo.InvariantCulture, $"{s.Minutes} min {s.Seconds:00} s")
                : string.Create(CultureInfo.InvariantCulture, $"{s.Seconds} s"));
    }

    public static string Phase(OpsLvp.Core.Engine.Phase p) => p.ToString().ToLowerInvariant();
}
