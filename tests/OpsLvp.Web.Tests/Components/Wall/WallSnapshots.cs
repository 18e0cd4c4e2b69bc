using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Tests.Components.Wall;

/// <summary>
/// Invented snapshots of the invented aerodrome XDMO for wall tests. Thresholds are the demo profile's illustrative
/// values (seed-demo/profile.json), not any aerodrome's approved values.
/// </summary>
public static class WallSnapshots
{
    /// <summary>Invented instant: a winter night, 2026-12-01 22:00Z.</summary>
    public static readonly DateTimeOffset At = new(2026, 12, 1, 22, 0, 0, TimeSpan.Zero);

    public static readonly ThresholdSet Thresholds = new(
        new PhaseThresholds { RvrBelowM = 1000, RvrRecoverM = 1200, CeilingBelowFt = 300, CeilingRecoverFt = 400, EnterDwellSeconds = 60, RecoverDwellSeconds = 900 },
        new PhaseThresholds { RvrBelowM = 550, RvrRecoverM = 650, CeilingBelowFt = 200, CeilingRecoverFt = 250, EnterDwellSeconds = 30, RecoverDwellSeconds = 600 });

    public static MeasuredValue Rvr(double metres, string sensor, string label, double ageSeconds = 20, bool stale = false) =>
        new(metres, sensor, label, At.AddSeconds(-ageSeconds), ageSeconds, stale);

    public static PositionRvr Fresh(RvrPosition position, string sensor, string label, double metres) =>
        new(position, sensor, Rvr(metres, sensor, label), false, true);

    /// <summary>Runway 07L with TDZ 700, MID 800, END 900 m, all fresh.</summary>
    public static RunwayRvrStatus Runway07L(params PositionRvr[] positions) => new(
        "07L/25R",
        "07L",
        positions.Length > 0
            ? positions
            : [
                Fresh(RvrPosition.Tdz, "rvr-07l-tdz", "07L TDZ", 700),
                Fresh(RvrPosition.Mid, "rvr-07l-mid", "07L MID", 800),
                Fresh(RvrPosition.End, "rvr-07l-end", "07L END", 900),
            ]);

    public static EngineStatus Status(Phase phase = Phase.Normal, IReadOnlyList<RunwayRvrStatus>? runways = null) => new(
        At,
        phase,
        At.AddMinutes(-72),
        phase == Phase.Normal ? null : new Episode("XDMO-20261201T2036Z", At.AddMinutes(-84), phase == Phase.Preparation ? Phase.Preparation : Phase.Active),
        Rvr(700, "rvr-07l-tdz", "07L TDZ"),
        new MeasuredValue(800, "ceil-main", "ceil-main", At.AddSeconds(-30), 30, false),
        true,
        runways ?? [Runway07L()],
        Thresholds,
        false,
        null,
        null,
        [],
        [])
    {
        // The wall's examples of "LVP in force" are safeguarded; the safeguards-open state has its own test.
        SafeguardsComplete = phase is Phase.Active or Phase.Cancellation,
    };

    public static LiveSnapshot Snapshot(
        EngineStatus? status = null,
        long version = 1,
        IReadOnlyList<ChecklistItemView>? items = null,
        IReadOnlyList<SensorTrend>? trends = null,
        IReadOnlyList<FeedHealthDto>? feeds = null,
        IReadOnlyList<string>? outOfService = null,
        DemoView? demo = null,
        string timeZone = "Europe/Lisbon") => new(
        version,
        At,
        new AerodromeView("XDMO", "Demo Field (invented)", timeZone, "test-1", true),
        status ?? Status(),
        items ?? [],
        outOfService ?? [],
        feeds ?? [],
        trends ?? [],
        demo);

    public static ChecklistItemView Item(string id, string text, string teamName, DateTimeOffset dueAt, bool overdue, ItemStatus status = ItemStatus.Open) =>
        new(id, text, Phase.Preparation, teamName.ToLowerInvariant().Replace(' ', '-'), teamName, true, At.AddMinutes(-30), dueAt, status, null, overdue);

    public static FeedHealthDto Feed(string name, string status, string? detail = null) =>
        new(name, "push", status, detail, At.AddSeconds(-10), At.AddSeconds(-10), 0, null, null, 3, 0, 30, 0, 0);
}
