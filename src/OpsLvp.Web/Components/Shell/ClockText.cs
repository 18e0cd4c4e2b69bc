using System.Globalization;

namespace OpsLvp.Web.Components.Shell;

/// <summary>How the shell shows the time: UTC, 24-hour, with a trailing Z (aviation practice, common practice).</summary>
public static class ClockText
{
    public static string Format(DateTimeOffset time) =>
        time.ToUniversalTime().ToString("yyyy-MM-dd HH:mm:ss'Z'", CultureInfo.InvariantCulture);
}
