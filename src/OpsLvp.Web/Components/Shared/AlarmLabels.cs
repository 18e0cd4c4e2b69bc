using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Components.Shared;

/// <summary>Short labels for alarm kinds and the ordering alarms are listed in.</summary>
public static class AlarmLabels
{
    public static string Label(AlarmKind kind) => kind switch
    {
        AlarmKind.GoverningRvrUnknown => "RVR unknown",
        AlarmKind.CeilingUnknown => "Ceiling unknown",
        AlarmKind.SensorSilent => "Sensor silent",
        AlarmKind.ItemOverdue => "Item overdue",
        AlarmKind.PendingTransition => "Confirm transition",
        AlarmKind.SafeguardsIncomplete => "Safeguards incomplete",
        AlarmKind.AuditStorageFailing => "Audit storage failing",
        AlarmKind.ClockRegression => "Clock stepped back",
        _ => kind.ToString(),
    };

    /// <summary>Unacknowledged first, then oldest first.</summary>
    public static IReadOnlyList<Alarm> Ordered(IEnumerable<Alarm>? alarms) =>
        (alarms ?? []).OrderBy(a => a.Acknowledged).ThenBy(a => a.RaisedAt).ThenBy(a => a.Key, StringComparer.Ordinal).ToList();

    /// <summary>Identity of one raising of an alarm: a re-raised alarm (same key, later instant) counts as new.</summary>
    public static string Identity(Alarm alarm) => $"{alarm.Key}@{alarm.RaisedAt.UtcTicks}";
}
