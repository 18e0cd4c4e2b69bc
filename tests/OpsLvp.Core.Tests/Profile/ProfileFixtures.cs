using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Profile;

/// <summary>A small valid profile (invented values) that each validation test breaks in one place.</summary>
internal static class ProfileFixtures
{
    public static AerodromeProfile Valid() => new()
    {
        Version = "test-1",
        Aerodrome = new AerodromeInfo("XTST", "Test Field (invented)", "UTC", Illustrative: true),
        Runways = [new RunwayConfig("09/27", ["09", "27"]), new RunwayConfig("18/36", ["18", "36"], Lvp: false)],
        Sensors =
        [
            new SensorConfig("t-09", SensorType.Transmissometer, "09/27", Sites("09", RvrPosition.Tdz, "27", RvrPosition.End), BaselineM: 75, LuminanceSensor: "lum"),
            new SensorConfig("f-mid", SensorType.ForwardScatter, "09/27", Sites("09", RvrPosition.Mid, "27", RvrPosition.Mid)),
            new SensorConfig("r-27", SensorType.RvrSystem, "09/27", Sites("09", RvrPosition.End, "27", RvrPosition.Tdz)),
            new SensorConfig("ceilo", SensorType.Ceilometer),
            new SensorConfig("lum", SensorType.Luminance),
        ],
        Teams = [new TeamConfig("ops", "Operations"), new TeamConfig("lights", "Lighting")],
        Lights = new LightsConfig { IntensityCdByStep = new Dictionary<int, double> { [3] = 1000, [5] = 10_000 }, StepInUse = 5 },
        MaxAgeSeconds = new Dictionary<ReadingKind, int>
        {
            [ReadingKind.Rvr] = 120,
            [ReadingKind.Transmittance] = 120,
            [ReadingKind.Extinction] = 120,
            [ReadingKind.CloudBase] = 180,
            [ReadingKind.VerticalVisibility] = 180,
            [ReadingKind.Visibility] = 180,
            [ReadingKind.BackgroundLuminance] = 300,
        },
        Thresholds = new ThresholdSet(
            new PhaseThresholds { RvrBelowM = 1000, RvrRecoverM = 1200, CeilingBelowFt = 300, CeilingRecoverFt = 400, EnterDwellSeconds = 60, RecoverDwellSeconds = 900 },
            new PhaseThresholds { RvrBelowM = 550, RvrRecoverM = 650, CeilingBelowFt = 200, CeilingRecoverFt = 250, EnterDwellSeconds = 30, RecoverDwellSeconds = 600 }),
        Checklists = new ChecklistSet
        {
            Preparation = [new ChecklistItemConfig("p1", "Stop works", "ops"), new ChecklistItemConfig("p2", "Check stop bars", "lights")],
            Active = [new ChecklistItemConfig("a1", "Clear ILS areas", "ops")],
            Cancellation = [new ChecklistItemConfig("c1", "Release ILS areas", "ops")],
        },
    };

    public static Dictionary<string, RvrPosition> Sites(string d1, RvrPosition p1, string d2, RvrPosition p2) =>
        new() { [d1] = p1, [d2] = p2 };

    public static AerodromeProfile WithPrep(this AerodromeProfile p, Func<PhaseThresholds, PhaseThresholds> change) =>
        p with { Thresholds = p.Thresholds with { Preparation = change(p.Thresholds.Preparation) } };

    public static AerodromeProfile WithActive(this AerodromeProfile p, Func<PhaseThresholds, PhaseThresholds> change) =>
        p with { Thresholds = p.Thresholds with { Active = change(p.Thresholds.Active) } };

    public static AerodromeProfile WithSensor(this AerodromeProfile p, int index, Func<SensorConfig, SensorConfig> change) =>
        p with { Sensors = p.Sensors.Select((s, i) => i == index ? change(s) : s).ToList() };

    /// <summary>The repository root, found by walking up from the test binaries to OpsLvp.sln.</summary>
    public static string RepoRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "OpsLvp.sln")))
            {
                return dir.FullName;
            }
        }
        throw new InvalidOperationException("OpsLvp.sln not found above " + AppContext.BaseDirectory);
    }
}
