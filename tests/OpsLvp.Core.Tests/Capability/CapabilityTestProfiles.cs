using OpsLvp.Core.Capability;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Capability;

/// <summary>
/// An invented capability section for runway 07/25 of the engine tests' XDMO profile. The RVR minima follow the
/// ICAO Annex 6 category bands as docs/sources.md "Approach categories" gives them (from memory): CAT I 550 m,
/// CAT II 300 m, CAT III 175 m at TDZ; the MID/END minima, the LVTO minima and every facility requirement are
/// invented and illustrative (local values of an aerodrome's instruction).
/// </summary>
public static class CapabilityTestProfiles
{
    public const double CatITdzM = 550;   // ICAO Annex 6 CAT I RVR ≥ 550 m (docs/sources.md, from memory)
    public const double CatIITdzM = 300;  // ICAO Annex 6 CAT II RVR ≥ 300 m (docs/sources.md, from memory)
    public const double CatIIMidM = 150;  // invented
    public const double CatIIITdzM = 175; // ICAO Annex 6 CAT IIIA RVR ≥ 175 m (docs/sources.md, from memory)
    public const double CatIIIMidM = 125; // invented
    public const double CatIIIEndM = 75;  // invented
    public const double LvtoM = 125;      // invented

    public static CapabilityProfile Runway07() => new()
    {
        ObserverRvrMaxAgeSeconds = 600,
        Facilities =
        [
            new FacilityConfig("ils-07", "ILS 07", FacilityKind.Ils, ["07"], "airside", IlsCategory: OperationKind.CatIII),
            new FacilityConfig("als-07", "Approach lights 07", FacilityKind.ApproachLighting, ["07"], "lighting"),
            new FacilityConfig("cl-07", "Centreline lights 07/25", FacilityKind.CentrelineLights, ["07", "25"], "lighting"),
            new FacilityConfig("tdzl-07", "TDZ lights 07", FacilityKind.TdzLights, ["07"], "lighting"),
            new FacilityConfig("sb-07", "Stop bars 07", FacilityKind.StopBars, ["07"], "lighting"),
            new FacilityConfig("power", "Standby power", FacilityKind.StandbyPower, ["07", "25"], "airside", SwitchOverSeconds: 1),
            new FacilityConfig("rvr-07t", "RVR sensor 07 TDZ", FacilityKind.RvrSensor, ["07", "25"], "airside", Sensor: "RVR07T"),
        ],
        Operations =
        [
            new OperationConfig("07", OperationKind.CatI, ["ils-07", "als-07"], [new(RvrPosition.Tdz, CatITdzM)], NeedsLvp: false),
            new OperationConfig("07", OperationKind.CatII, ["ils-07", "als-07", "cl-07", "power"],
                [new(RvrPosition.Tdz, CatIITdzM), new(RvrPosition.Mid, CatIIMidM)], NeedsLvp: true),
            new OperationConfig("07", OperationKind.CatIII, ["ils-07", "cl-07", "tdzl-07", "sb-07", "power"],
                [new(RvrPosition.Tdz, CatIIITdzM), new(RvrPosition.Mid, CatIIIMidM), new(RvrPosition.End, CatIIIEndM)], NeedsLvp: true,
                AcceptDegraded: ["power"]),
            new OperationConfig("07", OperationKind.Lvto, ["cl-07", "sb-07"],
                [new(RvrPosition.Tdz, LvtoM), new(RvrPosition.Mid, LvtoM), new(RvrPosition.End, LvtoM)], NeedsLvp: true),
            new OperationConfig("25", OperationKind.CatI, ["cl-07"], [new(RvrPosition.Tdz, CatITdzM)], NeedsLvp: false),
        ],
    };

    /// <summary>Sensor RVR for direction 07 at TDZ, MID, END (null: silent sensor).</summary>
    public static IReadOnlyList<PositionValue> Rvr07(double? tdz, double? mid, double? end) =>
    [
        Sensor("07", RvrPosition.Tdz, tdz),
        Sensor("07", RvrPosition.Mid, mid),
        Sensor("07", RvrPosition.End, end),
        Sensor("25", RvrPosition.Tdz, end),
        Sensor("25", RvrPosition.Mid, mid),
        Sensor("25", RvrPosition.End, tdz),
    ];

    public static PositionValue Sensor(string direction, RvrPosition position, double? value) =>
        new(direction, position, value, RvrSource.Sensor, value is null ? PositionGap.Silent : null);

    public static CapabilityInputs Inputs(
        IReadOnlyList<PositionValue> positions,
        LvpStanding lvp = LvpStanding.InForce,
        IReadOnlyDictionary<string, FacilityState>? facilities = null) =>
        new(facilities ?? new Dictionary<string, FacilityState>(), positions, lvp, new HashSet<string> { "07" });

    public static FacilityState Status(FacilityStatus status, string reason = "fault (invented)") =>
        new(status, reason, "lee (invented)", new DateTimeOffset(2026, 12, 1, 3, 0, 0, TimeSpan.Zero));
}
