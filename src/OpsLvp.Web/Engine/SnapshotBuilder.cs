using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Engine;

/// <summary>Builds the <see cref="LiveSnapshot"/> from the engine's description and the profile's texts; no decisions.</summary>
public static class SnapshotBuilder
{
    /// <summary>Key of the host's own alarm while audit entries cannot be committed.</summary>
    public const string AuditFailingKey = "audit-storage-failing";

    /// <summary>Key of the host's own alarm after the engine's time was found ahead of the clock.</summary>
    public const string ClockRegressionKey = "clock-regression";

    public static LiveSnapshot Build(
        long version,
        LvpEngine engine,
        EngineState state,
        DateTimeOffset now,
        IReadOnlyList<FeedHealth> feeds,
        IReadOnlyList<SensorTrend> trends,
        DemoView? demo,
        IReadOnlyList<Alarm> hostAlarms,
        RecordingView? recording = null,
        OpsLvp.Core.Optics.LightStepInUse? lightStep = null)
    {
        ArgumentNullException.ThrowIfNull(hostAlarms);
        var profile = engine.Profile;
        var status = engine.Describe(state, now);
        if (hostAlarms.Count > 0)
        {
            status = status with { Alarms = [.. hostAlarms, .. status.Alarms] };
        }
        var configs = new Dictionary<string, ChecklistItemConfig>(StringComparer.Ordinal);
        foreach (var c in profile.Checklists.Preparation.Concat(profile.Checklists.Active).Concat(profile.Checklists.Cancellation))
        {
            if (c is not null)
            {
                configs.TryAdd(c.Id, c);
            }
        }
        var teams = profile.Teams.Where(t => t is not null).GroupBy(t => t.Id).ToDictionary(g => g.Key, g => g.First().Name, StringComparer.Ordinal);
        var items = state.Items.Select(i => new ChecklistItemView(
            i.ItemId,
            configs.TryGetValue(i.ItemId, out var config) ? config.Text : i.ItemId,
            i.Phase,
            i.Team,
            teams.TryGetValue(i.Team, out var teamName) ? teamName : i.Team,
            i.Mandatory,
            i.OpenedAt,
            i.DueAt,
            i.Status,
            i.Tick,
            i.IsOverdue(now))).ToList();
        var info = profile.Aerodrome;
        return new LiveSnapshot(
            version,
            now,
            new AerodromeView(info.Id, info.Name, info.TimeZone, profile.Version, info.Illustrative) { TabletIdleSignOutMinutes = profile.TabletIdleSignOutMinutes },
            status,
            items,
            state.OutOfService.Order(StringComparer.Ordinal).ToList(),
            feeds.Select(FeedHealthDto.From).ToList(),
            trends,
            demo,
            recording ?? RecordingView.Ok,
            lightStep,
            [0, .. profile.Lights.IntensityCdByStep.Keys.Where(k => k != 0).Order()]);
    }
}
