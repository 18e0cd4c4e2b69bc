namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    private sealed partial class Run
    {
        public void Apply(EngineCommand command, DateTimeOffset now)
        {
            var refusal = Check(command, now);
            if (refusal is not null)
            {
                Events.Add(new CommandRefused(now, command, refusal));
            }
        }

        private void Applied(DateTimeOffset now, string actor, string action, string detail, string reason) =>
            Events.Add(new ManualActionApplied(now, actor, action, detail, reason));

        /// <summary>Applies the command, or returns why it cannot apply.</summary>
        private string? Check(EngineCommand command, DateTimeOffset now)
        {
            if (string.IsNullOrWhiteSpace(command.Actor))
            {
                return "actor is blank";
            }
            switch (command)
            {
                case DeclarePhase c:
                    return Declare(c, now);
                case CancelLvp c:
                    return Cancel(c, now);
                case ReleaseHold c:
                    if (Blank(c.Reason))
                    {
                        return "a reason is required to release a hold";
                    }
                    if (State.Hold is not { } hold)
                    {
                        return "no hold to release";
                    }
                    State = State with { Hold = null };
                    Applied(now, c.Actor, "release_hold", $"released hold on {Fmt.Name(hold.Phase)} declared by {hold.Actor}", c.Reason);
                    return null;
                case SetForecast c:
                    if (Blank(c.Reason))
                    {
                        return "a reason is required to set or clear the forecast";
                    }
                    if (State.DeteriorationForecast == c.On)
                    {
                        return $"deterioration forecast is already {(c.On ? "on" : "off")}";
                    }
                    State = State with { DeteriorationForecast = c.On };
                    Applied(now, c.Actor, "forecast", $"deterioration forecast {(c.On ? "on" : "off")}", c.Reason);
                    return null;
                case SetSensorService c:
                    if (Blank(c.Reason))
                    {
                        return "a reason is required to change a sensor's service state";
                    }
                    if (c.SensorId is null || !_model.Sensors.ContainsKey(c.SensorId))
                    {
                        return $"unknown sensor '{c.SensorId}'";
                    }
                    if (State.OutOfService.Contains(c.SensorId) != c.InService)
                    {
                        return $"sensor {c.SensorId} is already {(c.InService ? "in service" : "out of service")}";
                    }
                    State = State with { OutOfService = c.InService ? State.OutOfService.Remove(c.SensorId) : State.OutOfService.Add(c.SensorId) };
                    Applied(now, c.Actor, c.InService ? "sensor_in" : "sensor_out", $"sensor {c.SensorId} {(c.InService ? "back in service" : "out of service")}", c.Reason);
                    return null;
                case ConfirmPending c:
                    if (State.Pending is not { } pending)
                    {
                        return "nothing to confirm: no transition is pending";
                    }
                    Events.Add(new TransitionConfirmed(now, c.Actor, pending.From, pending.To, pending.ConditionMetAt, c.Reason));
                    Transition(pending.To, TransitionBy.Manual, c.Actor, pending.Reason, Situate(_model, State, now), pending.ConditionMetAt, now);
                    return null;
                case TickItem c:
                    return Tick(c, now);
                case UntickItem c:
                    return Untick(c, now);
                case AcknowledgeAlarm c:
                    var alarm = State.Alarms.FirstOrDefault(a => a.Key == c.AlarmKey);
                    if (alarm is null)
                    {
                        return $"no raised alarm '{c.AlarmKey}'";
                    }
                    if (alarm.Acknowledged)
                    {
                        return $"alarm '{c.AlarmKey}' already acknowledged by {alarm.AcknowledgedBy} at {Fmt.Time(alarm.AcknowledgedAt!.Value)}";
                    }
                    State = State with { Alarms = State.Alarms.Replace(alarm, alarm with { AcknowledgedBy = c.Actor, AcknowledgedAt = now }) };
                    Events.Add(new AlarmAcknowledged(now, alarm.Key, alarm.Kind, c.Actor));
                    return null;
                default:
                    return $"unknown command {command.GetType().Name}";
            }
        }

        private static bool Blank(string? s) => string.IsNullOrWhiteSpace(s);

        private string? Declare(DeclarePhase c, DateTimeOffset now)
        {
            if (c.Phase is not (Phase.Preparation or Phase.Active))
            {
                return $"only preparation or active can be declared, not {Fmt.Name(c.Phase)}";
            }
            if (Blank(c.Reason))
            {
                return "a reason is required to declare a phase";
            }
            State = State with { Hold = new Hold(c.Phase, c.Actor, c.Reason, now) };
            Applied(now, c.Actor, "declare", $"declared {Fmt.Name(c.Phase)} (hold)", c.Reason);
            var enters = c.Phase == Phase.Active ? State.Phase != Phase.Active : State.Phase == Phase.Normal;
            if (enters)
            {
                Transition(c.Phase, TransitionBy.Manual, c.Actor, $"declared by {c.Actor}: {c.Reason}", Situate(_model, State, now), null, now);
            }
            return null;
        }

        private string? Cancel(CancelLvp c, DateTimeOffset now)
        {
            if (Blank(c.Reason))
            {
                return "a reason is required to cancel";
            }
            Phase to;
            switch (State.Phase)
            {
                case Phase.Active:
                    to = Phase.Cancellation;
                    break;
                case Phase.Preparation:
                    to = Phase.Normal;
                    break;
                case Phase.Cancellation:
                    return "cancellation is already in progress";
                default:
                    return "nothing to cancel: the phase is normal";
            }
            if (State.Hold is { } hold && Severity(hold.Phase) >= Severity(State.Phase))
            {
                State = State with { Hold = null };
            }
            State = State with { EscalationMeasuredFrom = now };
            Applied(now, c.Actor, "cancel", $"cancelled {Fmt.Name(State.Phase)}", c.Reason);
            Transition(to, TransitionBy.Manual, c.Actor, $"cancelled by {c.Actor}: {c.Reason}", Situate(_model, State, now), null, now);
            return null;
        }
    }
}
