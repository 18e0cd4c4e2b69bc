using System.Globalization;
using System.Text;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Benchmarks.Engine;

/// <summary>
/// Inputs for the benchmarks, all invented and deterministic (fixed seeds): the demo profile from seed-demo, a
/// fog night of readings every 15 s from the profile's RVR sensors and ceilometers, and a set of METAR/SPECI reports
/// for the invented aerodrome XDMO.
/// </summary>
public static class BenchData
{
    /// <summary>Fixed start of the generated night (invented).</summary>
    public static readonly DateTimeOffset Start = new(2026, 1, 15, 12, 0, 0, TimeSpan.Zero);

    public const int Seed = 20261201;

    /// <summary>The repository root (the folder holding OpsLvp.sln), searched upwards from the program.</summary>
    public static string RepoRoot()
    {
        foreach (var start in new[] { AppContext.BaseDirectory, Directory.GetCurrentDirectory() })
        {
            for (var dir = new DirectoryInfo(start); dir is not null; dir = dir.Parent)
            {
                if (File.Exists(Path.Combine(dir.FullName, "OpsLvp.sln")))
                {
                    return dir.FullName;
                }
            }
        }
        throw new InvalidOperationException("OpsLvp.sln not found above the program folder or the current folder; run from the repository.");
    }

    /// <summary>seed-demo/profile.json: 9 RVR sensors, 2 ceilometers, 3 checklists.</summary>
    public static AerodromeProfile DemoProfile() => ProfileLoader.Load(Path.Combine(RepoRoot(), "seed-demo", "profile.json"));

    public static IReadOnlyList<string> RvrSensors(AerodromeProfile profile) =>
        profile.Sensors.Where(s => s.Type is SensorType.Transmissometer or SensorType.ForwardScatter or SensorType.RvrSystem).Select(s => s.Id).ToList();

    public static IReadOnlyList<string> Ceilometers(AerodromeProfile profile) =>
        profile.Sensors.Where(s => s.Type == SensorType.Ceilometer).Select(s => s.Id).ToList();

    /// <summary>
    /// <paramref name="hours"/> of readings every 15 s from every RVR sensor (RVR, metres) and ceilometer (cloud base,
    /// feet), in time order. RVR falls from 2000 m to about 300 m in the middle of the period and recovers, with
    /// per-sensor offsets and noise; cloud base follows from 1500 ft to about 150 ft. Invented values.
    /// </summary>
    public static List<Reading> FogNight(AerodromeProfile profile, double hours, DateTimeOffset? start = null)
    {
        var rvr = RvrSensors(profile);
        var ceilo = Ceilometers(profile);
        var random = new Random(Seed);
        var from = start ?? Start;
        var steps = (int)(hours * 3600 / 15);
        var readings = new List<Reading>(steps * (rvr.Count + ceilo.Count));
        for (var i = 0; i < steps; i++)
        {
            var t = from.AddSeconds(15 * i);
            // 0 at the ends of the period, 1 in the middle: how deep the fog is.
            var depth = Math.Sin(Math.PI * i / Math.Max(1, steps - 1));
            for (var s = 0; s < rvr.Count; s++)
            {
                var value = 2000 - (1700 * depth) + (s * 25) + ((random.NextDouble() - 0.5) * 120);
                readings.Add(new Reading(t, rvr[s], ReadingKind.Rvr, Math.Round(Math.Clamp(value, 50, 2000)), ReadingStatus.Ok));
            }
            for (var c = 0; c < ceilo.Count; c++)
            {
                var value = 1500 - (1350 * depth) + (c * 20) + ((random.NextDouble() - 0.5) * 40);
                readings.Add(new Reading(t, ceilo[c], ReadingKind.CloudBase, Math.Round(Math.Max(value, 50)), ReadingStatus.Ok));
            }
        }
        return readings;
    }

    /// <summary>The readings as a replay readings CSV (docs/replay.md).</summary>
    public static string ToCsv(IReadOnlyList<Reading> readings)
    {
        var sb = new StringBuilder(readings.Count * 48);
        sb.Append(ReadingsCsv.Header).Append('\n');
        foreach (var r in readings)
        {
            sb.Append(r.Time.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture)).Append(',')
              .Append(r.SensorId).Append(',')
              .Append(ReadingsCsv.KindName(r.Kind)).Append(',')
              .Append(r.Value.ToString(CultureInfo.InvariantCulture)).Append(",ok\n");
        }
        return sb.ToString();
    }

    /// <summary>Invented METAR/SPECI reports for XDMO, from clear to thick fog, with RVR, weather and cloud groups.</summary>
    public static List<string> Metars(int count)
    {
        var random = new Random(Seed);
        var reports = new List<string>(count);
        string[] weather = ["", " BR", " FG", " BCFG", " MIFG", " -DZ BR", " FZFG"];
        for (var i = 0; i < count; i++)
        {
            var day = 1 + (i % 28);
            var hour = i % 24;
            var minute = (i % 2) * 30 + 20;
            var type = i % 5 == 4 ? "SPECI" : "METAR";
            var vis = (int)(random.NextDouble() * 10) switch
            {
                0 => 100,
                1 => 200,
                2 => 350,
                3 => 600,
                4 => 900,
                5 => 1500,
                6 => 3000,
                7 => 6000,
                _ => 9999,
            };
            var sb = new StringBuilder();
            sb.Append(CultureInfo.InvariantCulture, $"{type} XDMO {day:00}{hour:00}{minute:00}Z {(i % 3 == 0 ? "VRB02KT" : "24004KT")} {vis:0000}");
            if (vis < 1500)
            {
                foreach (var rwy in new[] { "07L", "07R" })
                {
                    var r = Math.Clamp(vis + random.Next(-100, 300), 50, 2000);
                    var tend = (random.Next(3)) switch { 0 => "U", 1 => "D", _ => "N" };
                    sb.Append(CultureInfo.InvariantCulture, $" R{rwy}/{(r >= 2000 ? "P2000" : r.ToString("0000", CultureInfo.InvariantCulture))}{tend}");
                }
            }
            sb.Append(vis < 1000 ? weather[2 + random.Next(weather.Length - 2)] : vis < 5000 ? " BR" : "");
            var cloud = vis < 300 ? " VV001" : vis < 1000 ? $" BKN{random.Next(1, 4):000}" : $" SCT{random.Next(10, 40):000}";
            sb.Append(cloud);
            sb.Append(CultureInfo.InvariantCulture, $" 0{random.Next(2, 8)}/0{random.Next(0, 2)} Q10{random.Next(10, 30)}");
            if (i % 4 == 0)
            {
                sb.Append(" NOSIG");
            }
            reports.Add(sb.ToString());
        }
        return reports;
    }
}
