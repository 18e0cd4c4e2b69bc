using System.Globalization;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine.Replay;

/// <summary>
/// Readings CSV (docs/replay.md): header <c>time,sensor,kind,value,status</c>; time ISO 8601 with Z or an
/// offset; kind rvr | visibility | cloud_base | vertical_visibility | extinction | transmittance |
/// background_luminance | light_step; value a number with a point; status ok | degraded | failed | maintenance.
/// Syntax errors throw <see cref="FormatException"/> naming the file and line; screening (ranges,
/// sensors) is the engine's job, so a well-formed but implausible line parses and is rejected there.
/// </summary>
public static class ReadingsCsv
{
    public const string Header = "time,sensor,kind,value,status";

    /// <summary>Parses the whole file text, keeping file order.</summary>
    public static IReadOnlyList<Reading> Parse(string text, string fileName)
    {
        ArgumentNullException.ThrowIfNull(text);
        var readings = new List<Reading>();
        foreach (var row in Csv.Rows(text, fileName, Header, 5))
        {
            var f = row.Fields;
            var time = row.TimeAt(0);
            var sensor = f[1].Trim();
            if (sensor.Length == 0)
            {
                throw row.Error("sensor is empty");
            }
            var kind = ParseKind(f[2].Trim()) ?? throw row.Error($"unknown kind '{f[2]}'");
            if (!double.TryParse(f[3].Trim(), NumberStyles.Float, CultureInfo.InvariantCulture, out var value))
            {
                throw row.Error($"bad value '{f[3]}'");
            }
            var status = ParseStatus(f[4].Trim()) ?? throw row.Error($"unknown status '{f[4]}' (ok, degraded, failed, maintenance)");
            readings.Add(new Reading(time, sensor, kind, value, status));
        }
        return readings;
    }

    /// <summary>The snake_case name of a kind, as in the file.</summary>
    public static string KindName(ReadingKind kind) => kind switch
    {
        ReadingKind.Rvr => "rvr",
        ReadingKind.Visibility => "visibility",
        ReadingKind.CloudBase => "cloud_base",
        ReadingKind.VerticalVisibility => "vertical_visibility",
        ReadingKind.Extinction => "extinction",
        ReadingKind.Transmittance => "transmittance",
        ReadingKind.BackgroundLuminance => "background_luminance",
        ReadingKind.LightStep => "light_step",
        _ => kind.ToString().ToLowerInvariant(),
    };

    private static ReadingKind? ParseKind(string s) =>
        Enum.GetValues<ReadingKind>().Select(k => (ReadingKind?)k).FirstOrDefault(k => KindName(k!.Value) == s);

    private static ReadingStatus? ParseStatus(string s) => s switch
    {
        "ok" => ReadingStatus.Ok,
        "degraded" => ReadingStatus.Degraded,
        "failed" => ReadingStatus.Failed,
        "maintenance" => ReadingStatus.Maintenance,
        _ => null,
    };
}
