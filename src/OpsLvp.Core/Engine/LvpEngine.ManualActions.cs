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
            if (CommandPreconditions.Check(command, _model.Profile) is { } incomplete)
            {
                return incomplete;
            }
            switch (command)
            {
                case DeclarePhase c:
                    return Declare(c, now);
                case CancelLvp c:
                    return Cancel(c, now);
                case ReleaseHold c:
                    if (State.Hold is not { } hold)
                    {
                        return "no hold to release";
                    }
                    State = State with { Hold = null };
                    Applied(now, c.Actor, "release_hold", $"released hold on {Fmt.Words(hold.Phase)} declared by {hold.Actor}", c.Reason);
                    return null;
                case SetForecast c:
                    return SetForecastByHand(c, now); // docs/engine.md R27
                case ReleaseForecast c:
                    return Release(c, now);
                case SetSensorService c:
                    if (State.OutOfService.Contains(c.SensorId) != c.InService)
                    {
                        return $"sensor {c.SensorId} is already {(c.InService ? "in service" : "out of service")}";
                    }
                    State = State with { OutOfService = c.InService ? State.OutOfService.Remove(c.SensorId) : State.OutOfService.Add(c.SensorId) };
                    Applied(now, c.Actor, c.InService ? "sensor_in" : "sensor_out", $"sensor {c.SensorId} {(c.InService ? "back in service" : "out of service")}", c.Reason);
                    return null;
                case SetLightStep c:
                    // no "already set" refusal: a lighting sensor may have changed the step since (R20)
                    State = State with { ManualLightStep = new ManualLightStep(c.Step, c.Actor, c.Reason, now) };
                    Applied(now, c.Actor, "light_step", $"light step {c.Step}{(c.Step == 0 ? " (lights off)" : "")}", c.Reason);
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
                case MarkNotApplicable c:
                    return MarkNotApplicable(c, now);
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
                case SetFacilityStatus or SetRunwayInUse or EnterObserverRvr:
                    return ApplyCapabilityCommand(command, now);
                default:
                    return $"unknown command {command.GetType().Name}";
            }
        }

        /// <summary>Whether the recovery condition (without its dwell) of <paramref name="from"/> holds (R5).</summary>
        private static bool RecoveryHolds(Phase from, Situation sit) =>
            from == Phase.Active ? sit.RecoveryFromActive : sit.RecoveryFromPreparation;

        private string? Declare(DeclarePhase c, DateTimeOffset now)
        {
            var enters = c.Phase == Phase.Active ? State.Phase != Phase.Active : State.Phase == Phase.Normal;
            var open = enters && c.Phase == Phase.Active && _model.Profile.InForceNeedsSafeguards ? OpenSafeguards() : [];
            if (open.Count > 0 && c.SafeguardsOverride is null)
            {
                return $"safeguards incomplete: {string.Join(", ", open)} open; declare active with an override reason to enter it anyway";
            }
            State = State with { Hold = new Hold(c.Phase, c.Actor, c.Reason, now) };
            Applied(now, c.Actor, "declare", $"declared {Fmt.Name(c.Phase)} (hold)", c.Reason);
            var reason = $"declared by {c.Actor}: {c.Reason}";
            if (open.Count > 0 && c.SafeguardsOverride is { } why)
            {
                Applied(now, c.Actor, "override_safeguards", $"active declared with safeguards open: {string.Join(", ", open)}", why);
                reason += $"; safeguards overridden ({string.Join(", ", open)} open): {why}";
            }
            if (enters)
            {
                Transition(c.Phase, TransitionBy.Manual, c.Actor, reason, Situate(_model, State, now), null, now);
            }
            if (open.Count > 0 && c.SafeguardsOverride is { } overrideReason)
            {
                // after the transition: entering active from normal starts the episode the record belongs to
                State = State with { SafeguardsOverride = new SafeguardsOverride(c.Actor, overrideReason, now, open.ToArray()) };
            }
            return null;
        }

        private string? Cancel(CancelLvp c, DateTimeOffset now)
        {
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
            var from = State.Phase;
            var sit = Situate(_model, State, now);
            Applied(now, c.Actor, "cancel", $"cancelled {Fmt.Words(from)}", c.Reason);
            Transition(to, TransitionBy.Manual, c.Actor, $"cancelled by {c.Actor}: {c.Reason}", sit, null, now);
            if (!RecoveryHolds(from, sit))
            {
                // against the conditions (R15): recorded until the recovery condition of the phase left holds
                State = State with { RelaxedAgainstConditions = new Relaxation(c.Actor, from, to, now, c.Reason) };
            }
            return null;
        }
    }
}
