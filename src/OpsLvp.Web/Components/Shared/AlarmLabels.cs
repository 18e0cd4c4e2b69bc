using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Web.Components.Shared;

/// <summary>Short labels for alarm kinds and the ordering alarms are listed in.</summary>
public static class AlarmLabels
{
    /// <summary>The kind's label from the one vocabulary (<see cref="AlarmWords.Label"/>).</summary>
    public static string Label(AlarmKind kind) => AlarmWords.Label(kind);

    /// <summary>Unacknowledged first, then oldest first.</summary>
    public static IReadOnlyList<Alarm> Ordered(IEnumerable<Alarm>? alarms) =>
        (alarms ?? []).OrderBy(a => a.Acknowledged).ThenBy(a => a.RaisedAt).ThenBy(a => a.Key, StringComparer.Ordinal).ToList();

    /// <summary>Identity of one raising of an alarm: a re-raised alarm (same key, later instant) counts as new.</summary>
    public static string Identity(Alarm alarm) => $"{alarm.Key}@{alarm.RaisedAt.UtcTicks}";
}
