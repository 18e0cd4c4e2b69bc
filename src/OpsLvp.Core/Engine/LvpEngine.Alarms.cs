using System.Collections.Immutable;
using System.Runtime.CompilerServices;
using OpsLvp.Core.Checklists;

namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    private sealed partial class Run
    {
        private static readonly ConditionalWeakTable<ChecklistItemState, Tuple<string, string>> OverdueTexts = new();

        private void ReconcileAlarms(Situation sit, DateTimeOffset t)
        {
            var wanted = new List<(string Key, AlarmKind Kind, string Message)>();
            if (_model.RvrConfigured && sit.RvrM is null)
            {
                wanted.Add((AlarmKeys.RvrUnknown, AlarmKind.GoverningRvrUnknown, "governing RVR unknown: no fresh reading from any governing sensor"));
            }
            if (_model.CeilingConfigured && sit.CeilingFt is null)
            {
                wanted.Add((AlarmKeys.CeilingUnknown, AlarmKind.CeilingUnknown, "ceiling unknown: no fresh reading from any ceilometer"));
            }
            foreach (var sensor in _model.SensorEntries)
            {
                if (!State.OutOfService.Contains(sensor.Sensor.Id) && IsSilent(sensor, t))
                {
                    wanted.Add((sensor.SilentAlarmKey, AlarmKind.SensorSilent, sensor.SilentAlarmMessage));
                }
            }
            foreach (var item in State.Items)
            {
                if (item.IsOverdue(t))
                {
                    var (key, message) = OverdueAlarm(item);
                    wanted.Add((key, AlarmKind.ItemOverdue, message));
                }
            }
            if (State.Pending is { } p)
            {
                wanted.Add((AlarmKeys.Pending, AlarmKind.PendingTransition, $"confirm {Fmt.Change(p.From, p.To)}: {p.Reason}"));
            }
            if (State.Episode is not null && sit.Active && !Safeguards.AreComplete(State.Episode, State.Items))
            {
                wanted.Add((AlarmKeys.SafeguardsIncomplete, AlarmKind.SafeguardsIncomplete, "active condition holds while mandatory preparation items are open"));
            }
            CapabilityAlarms(wanted);
            var alarms = State.Alarms;
            foreach (var old in State.Alarms)
            {
                // a changed message is a new cause under the same key (e.g. a different pending transition): raise it afresh
                if (!IsWanted(wanted, old))
                {
                    alarms = alarms.Remove(old);
                    Events.Add(new AlarmCleared(t, old.Key, old.Kind));
                }
            }
            foreach (var (key, kind, message) in wanted)
            {
                if (!HasKey(alarms, key))
                {
                    var alarm = new Alarm(key, kind, message, t);
                    alarms = alarms.Add(alarm);
                    Events.Add(new AlarmRaised(t, alarm));
                }
            }
            if (!ReferenceEquals(alarms, State.Alarms))
            {
                State = State with { Alarms = alarms };
            }
        }

        private static bool IsWanted(List<(string Key, AlarmKind Kind, string Message)> wanted, Alarm alarm)
        {
            foreach (var w in wanted)
            {
                if (w.Key == alarm.Key && w.Message == alarm.Message)
                {
                    return true;
                }
            }
            return false;
        }

        private static bool HasKey(ImmutableList<Alarm> alarms, string key)
        {
            foreach (var a in alarms)
            {
                if (a.Key == key)
                {
                    return true;
                }
            }
            return false;
        }

        /// <summary>The overdue alarm's key and message of an item, formatted once per item instance (items are immutable).</summary>
        private static (string Key, string Message) OverdueAlarm(ChecklistItemState item)
        {
            var texts = OverdueTexts.GetValue(item, static i => Tuple.Create(
                AlarmKeys.ItemOverdue(i.ItemId), $"item {i.ItemId} ({i.Team}) overdue since {Fmt.Time(i.DueAt)}"));
            return (texts.Item1, texts.Item2);
        }

        private bool IsSilent(EngineModel.SensorEntry sensor, DateTimeOffset t)
        {
            var any = false;
            foreach (var key in sensor.ProducedKeys)
            {
                if (State.Latest.TryGetValue(key, out var r))
                {
                    any = true;
                    if (_model.IsFresh(r, t))
                    {
                        return false;
                    }
                }
            }
            return any || t >= MonitoringSince + sensor.PrimaryMaxAge;
        }
    }
}
