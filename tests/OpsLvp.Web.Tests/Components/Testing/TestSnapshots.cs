using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Tests.Components.Testing;

/// <summary>Invented snapshots for component tests (aerodrome XDMO, invented teams, people and times).</summary>
public static class TestSnapshots
{
    public static readonly DateTimeOffset T0 = new(2026, 12, 1, 3, 0, 0, TimeSpan.Zero);

    public static readonly Episode Episode = new("XDMO-20261201T030000Z", T0, Phase.Preparation);

    public static readonly ThresholdSet Thresholds = new(
        new PhaseThresholds { RvrBelowM = 1000, RvrRecoverM = 1100, EnterDwellSeconds = 30, RecoverDwellSeconds = 900 },
        new PhaseThresholds { RvrBelowM = 550, RvrRecoverM = 650, EnterDwellSeconds = 30, RecoverDwellSeconds = 600 });

    public static ChecklistItemView Item(
        string id, string team, ItemStatus status = ItemStatus.Open, int dueMinutes = 10, bool overdue = false,
        ItemTick? tick = null, Phase phase = Phase.Preparation, DateTimeOffset? openedAt = null, bool mandatory = true)
    {
        var opened = openedAt ?? T0;
        return new ChecklistItemView(id, $"Item {id} (invented)", phase, team, TeamName(team), mandatory, opened, opened.AddMinutes(dueMinutes), status, tick, overdue);
    }

    public static string TeamName(string team) => team switch
    {
        "airside" => "Airside Ops (invented)",
        "lighting" => "AGL Crew (invented)",
        _ => $"{team} (invented)",
    };

    public static LiveSnapshot Make(
        long version,
        Phase phase = Phase.Preparation,
        IReadOnlyList<ChecklistItemView>? items = null,
        IReadOnlyList<Alarm>? alarms = null,
        PendingTransition? pending = null,
        Hold? hold = null,
        bool safeguardsComplete = false,
        DateTimeOffset? at = null,
        IReadOnlyList<WaitingFor>? waiting = null,
        IReadOnlyList<string>? outOfService = null,
        bool forecast = false)
    {
        var now = at ?? T0.AddMinutes(5);
        var episode = phase == Phase.Normal ? null : Episode;
        var runway = new RunwayRvrStatus("07/25", "07",
        [
            new PositionRvr(RvrPosition.Tdz, "RVR07T", new MeasuredValue(500, "RVR07T", "07 TDZ", now, 10, false), outOfService?.Contains("RVR07T") == true, true),
            new PositionRvr(RvrPosition.Mid, "RVR07M", new MeasuredValue(600, "RVR07M", "07 MID", now, 10, false), outOfService?.Contains("RVR07M") == true, true),
            new PositionRvr(RvrPosition.End, null, null, false, false),
        ]);
        var status = new EngineStatus(
            now, phase, T0, episode, new MeasuredValue(500, "RVR07T", "07 TDZ", now, 10, false), null, false, [runway],
            Thresholds, forecast, hold, pending, alarms ?? [], waiting ?? [])
        {
            SafeguardsComplete = safeguardsComplete,
        };
        return new LiveSnapshot(
            version, now, new AerodromeView("XDMO", "Demo Field (invented)", "UTC", "test-1 (invented)", true),
            status, items ?? [], outOfService ?? [], [], [], null);
    }
}
