using System.Globalization;

namespace OpsLvp.Web.Feeds.Demo;

/// <summary>
/// The <c>time</c> column of a scenario CSV: either ISO-8601 with an offset (<c>2026-01-15T03:00:00Z</c>) or
/// an offset from the start of the scenario (<c>00:05:00</c>, <c>1.02:00:00</c>). One file uses one style.
/// </summary>
public static class ScenarioTime
{
    public static string? Parse(string text, out DateTimeOffset? absolute, out TimeSpan relative)
    {
        absolute = null;
        relative = default;
        if (text.Contains('T', StringComparison.Ordinal))
        {
            var error = ReadingFields.Time(text, out var time);
            absolute = time;
            return error;
        }

        if (TimeSpan.TryParseExact(text, ["c", @"hh\:mm\:ss", @"h\:mm\:ss", @"mm\:ss"], CultureInfo.InvariantCulture, out relative)
            && relative >= TimeSpan.Zero)
        {
            return null;
        }

        return $"time '{ReadingFields.Clip(text)}' is neither ISO-8601 with an offset nor an offset like 00:05:00";
    }
}
