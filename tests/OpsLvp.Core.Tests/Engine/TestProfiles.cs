using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// Test profiles for the invented aerodrome XDMO "Demo Field (invented)". Every value is invented; the
/// thresholds follow the illustrative examples of docs/engine.md R4/R5/R7 (LVP thresholds and dwells are local
/// values, docs/sources.md "LVP phases": from memory), not any real aerodrome's instruction.
/// Runway 07/25 (LVP) with RVR07T (TDZ for 07, END for 25), RVR07M (MID), RVR25T (END for 07, TDZ for 25),
/// runway 12/30 (not LVP) with RVR12T, ceilometer CEIL1, visibility sensor VIS1.
/// </summary>
public static class TestProfiles
{
    public static readonly DateTimeOffset T0 = new(2026, 12, 1, 3, 0, 0, TimeSpan.Zero);

    /// <summary>
    /// The profile most engine tests use. It takes the local choice <c>inForceNeedsSafeguards: false</c>
    /// (docs/engine.md R13) so the R1–R12 tests exercise dwells, transitions and checklists on their own;
    /// <see cref="Safeguarded"/> is the default (true), tested in <c>SafeguardsTests</c>.
    /// </summary>
    public static AerodromeProfile Standard() => new()
    {
        Version = "test-1 (invented)",
        InForceNeedsSafeguards = false,
        Aerodrome = new AerodromeInfo("XDMO", "Demo Field (invented)", Illustrative: true),
        Runways =
        [
            new RunwayConfig("07/25", ["07", "25"]),
            new RunwayConfig("12/30", ["12", "30"], Lvp: false),
        ],
        Sensors =
        [
            new SensorConfig("RVR07T", SensorType.RvrSystem, "07/25", new Dictionary<string, RvrPosition> { ["07"] = RvrPosition.Tdz, ["25"] = RvrPosition.End }),
            new SensorConfig("RVR07M", SensorType.RvrSystem, "07/25", new Dictionary<string, RvrPosition> { ["07"] = RvrPosition.Mid, ["25"] = RvrPosition.Mid }),
            new SensorConfig("RVR25T", SensorType.ForwardScatter, "07/25", new Dictionary<string, RvrPosition> { ["07"] = RvrPosition.End, ["25"] = RvrPosition.Tdz }),
            new SensorConfig("RVR12T", SensorType.RvrSystem, "12/30", new Dictionary<string, RvrPosition> { ["12"] = RvrPosition.Tdz }),
            new SensorConfig("CEIL1", SensorType.Ceilometer),
            new SensorConfig("VIS1", SensorType.Visibility),
        ],
        Teams = [new TeamConfig("airside", "Airside Ops (invented)"), new TeamConfig("lighting", "AGL Crew (invented)"), new TeamConfig("atc", "Tower Liaison (invented)")],
        MaxAgeSeconds = new Dictionary<ReadingKind, int>
        {
            [ReadingKind.Rvr] = 120,
            [ReadingKind.CloudBase] = 300,
            [ReadingKind.VerticalVisibility] = 300,
            [ReadingKind.Visibility] = 300,
        },
        Thresholds = new ThresholdSet(
            Preparation: new PhaseThresholds
            {
                RvrBelowM = 1000, RvrRecoverM = 1100, CeilingBelowFt = 300, CeilingRecoverFt = 350,
                EnterDwellSeconds = 30, RecoverDwellSeconds = 900,
            },
            Active: new PhaseThresholds
            {
                RvrBelowM = 550, RvrRecoverM = 650, CeilingBelowFt = 200, CeilingRecoverFt = 250,
                EnterDwellSeconds = 30, RecoverDwellSeconds = 600,
            }),
        Checklists = new ChecklistSet
        {
            Preparation =
            [
                new ChecklistItemConfig("P1", "Suspend airside works (invented)", "airside", true, 10),
                new ChecklistItemConfig("P2", "Check stop bars (invented)", "lighting", true, 15),
            ],
            Active = [new ChecklistItemConfig("A1", "Confirm ILS critical areas clear (invented)", "atc", true, 5)],
            Cancellation =
            [
                new ChecklistItemConfig("C1", "Release vehicle restrictions (invented)", "airside", true, 10),
                new ChecklistItemConfig("C2", "Log lighting hours (invented)", "lighting", false, 30),
            ],
        },
    };

    /// <summary>The standard profile without ceilometers (an aerodrome that has none, docs/engine.md R5).</summary>
    public static AerodromeProfile WithoutCeilometer() => Standard() with
    {
        Sensors = Standard().Sensors.Where(s => s.Type != SensorType.Ceilometer).ToList(),
    };

    /// <summary>The standard profile where the given transitions need confirmation (docs/engine.md R10).</summary>
    public static AerodromeProfile Confirming(params TransitionRule[] rules) => Standard() with { Confirm = rules };

    /// <summary>The standard profile with the default <c>inForceNeedsSafeguards: true</c> (docs/engine.md R13).</summary>
    public static AerodromeProfile Safeguarded() => Standard() with { InForceNeedsSafeguards = true };

    /// <summary>The governing RVR sensors of <see cref="Standard"/> for direction 07.</summary>
    public static readonly string[] GoverningRvr = ["RVR07T", "RVR07M", "RVR25T"];
}
