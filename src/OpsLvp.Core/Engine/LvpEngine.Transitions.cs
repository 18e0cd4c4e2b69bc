using OpsLvp.Core.Checklists;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    private sealed partial class Run
    {
        private void StepOnce(DateTimeOffset t)
        {
            UpdateForecast(t); // docs/engine.md R26–R28
            for (var i = 0; i < MaxTransitionsPerInstant; i++)
            {
                var sit = SituateNow(t);
                UpdateHolding(sit, t);
                if (State.RelaxedAgainstConditions is { } relaxed && RecoveryHolds(relaxed.From, sit))
                {
                    State = State with { RelaxedAgainstConditions = null };
                }
                var desired = Desired(sit, t);
                if (State.Pending is { } pending && (desired is null || desired.Value.To != pending.To))
                {
                    var why = desired is { } other
                        ? $"superseded: {Fmt.Change(pending.From, other.To)} is due instead"
                        : State.Hold is { } hold && Severity(pending.To) < Severity(hold.Phase)
                            ? $"hold on {Fmt.Words(hold.Phase)} declared by {hold.Actor}"
                            : pending.To == Phase.Active && DwellDone(ConditionKind.Active, t)
                                ? SafeguardsIncompleteText()
                                : "condition no longer holds";
                    Events.Add(new ProposalWithdrawn(t, pending.From, pending.To, pending.ConditionMetAt, why));
                    State = State with { Pending = null };
                }
                if (desired is not { } d)
                {
                    break;
                }
                if (_model.NeedsConfirmation(State.Phase, d.To))
                {
                    if (State.Phase == Phase.Normal && d.To == Phase.Active && !_model.NeedsConfirmation(Phase.Normal, Phase.Preparation))
                    {
                        // never a calmer screen than the conditions (R14): preparation needs no confirmation, so it is entered now
                        Transition(Phase.Preparation, TransitionBy.Auto, null, $"{d.Reason}; {Fmt.Change(Phase.Normal, Phase.Active)} needs confirmation", sit, null, t);
                        continue;
                    }
                    if (State.Pending is null)
                    {
                        var snapshot = Snapshot(sit);
                        State = State with { Pending = new PendingTransition(State.Phase, d.To, t, d.Reason, snapshot) };
                        Events.Add(new TransitionProposed(t, State.Phase, d.To, d.Reason, snapshot));
                    }
                    break;
                }
                Transition(d.To, TransitionBy.Auto, null, d.Reason, sit, null, t);
            }
            UpdateCapability(t);
            ReconcileAlarms(SituateNow(t), t);
        }

        /// <summary>Safeguards still open: mandatory preparation items neither done nor not applicable; before an episode, all of them (R13).</summary>
        private IReadOnlyList<string> OpenSafeguards() =>
            State.Episode is null ? _model.MandatoryPreparationIds : Safeguards.Outstanding(State.Items);

        /// <summary>Whether open safeguards keep the phase below active (R13; off when the profile says so).</summary>
        private bool SafeguardsBlockInForce() => _model.Profile.InForceNeedsSafeguards && OpenSafeguards().Count > 0;

        private string SafeguardsIncompleteText() => $"{LvpEngine.SafeguardsIncompleteHeadline}: {string.Join(", ", OpenSafeguards())} open";

        private bool HoldAtLeast(Phase phase) => State.Hold is { } h && Severity(h.Phase) >= Severity(phase);

        private static int Severity(Phase phase) => phase switch
        {
            Phase.Active => 2,
            Phase.Preparation => 1,
            _ => 0,
        };

        /// <summary>The automatic transition due at <paramref name="t"/> (R8), ignoring confirmation.</summary>
        private (Phase To, string Reason)? Desired(Situation sit, DateTimeOffset t)
        {
            switch (State.Phase)
            {
                case Phase.Normal:
                    if (DwellDone(ConditionKind.Active, t))
                    {
                        return SafeguardsBlockInForce()
                            ? (Phase.Preparation, $"{ActiveReason(sit)}; {SafeguardsIncompleteText()}")
                            : (Phase.Active, ActiveReason(sit));
                    }
                    if (DwellDone(ConditionKind.Preparation, t))
                    {
                        return (Phase.Preparation, PreparationReason(sit));
                    }
                    return null;
                case Phase.Preparation:
                    if (DwellDone(ConditionKind.Active, t))
                    {
                        // held here while safeguards are open (R13): the last one done makes the transition due
                        return SafeguardsBlockInForce() ? null : (Phase.Active, ActiveReason(sit));
                    }
                    if (DwellDone(ConditionKind.RecoveryFromPreparation, t) && !HoldAtLeast(Phase.Preparation))
                    {
                        return (Phase.Normal, RecoveryReason(sit, Thresholds.Preparation, ConditionKind.RecoveryFromPreparation));
                    }
                    return null;
                case Phase.Active:
                    if (DwellDone(ConditionKind.RecoveryFromActive, t) && !HoldAtLeast(Phase.Active))
                    {
                        return (Phase.Cancellation, RecoveryReason(sit, Thresholds.Active, ConditionKind.RecoveryFromActive));
                    }
                    return null;
                case Phase.Cancellation:
                    if (DwellDone(ConditionKind.Active, t))
                    {
                        return SafeguardsBlockInForce()
                            ? (Phase.Preparation, $"re-instated: {ActiveReason(sit)}; {SafeguardsIncompleteText()}")
                            : (Phase.Active, "re-instated: " + ActiveReason(sit));
                    }
                    if (!State.Items.Any(i => i.Phase == Phase.Cancellation && i.Mandatory && i.Status == ItemStatus.Open))
                    {
                        var recovered = DwellDone(ConditionKind.RecoveryFromPreparation, t) && !HoldAtLeast(Phase.Preparation);
                        var what = _model.ItemsOf(Phase.Cancellation).Any(i => i.Mandatory)
                            ? "mandatory cancellation items done"
                            : "no mandatory cancellation items";
                        return recovered
                            ? (Phase.Normal, $"{what}; recovery from preparation held {Fmt.Span(_model.Dwell(ConditionKind.RecoveryFromPreparation))}")
                            : (Phase.Preparation, $"{what}; {(HoldAtLeast(Phase.Preparation) ? $"{Fmt.Words(Phase.Preparation)} hold in force" : "recovery from preparation not yet held its dwell")}");
                    }
                    return null;
                default:
                    return null;
            }
        }

        private string ActiveReason(Situation sit)
        {
            var a = Thresholds.Active;
            if (a.Enters(sit.RvrM, a.RvrBelowM))
            {
                return $"RVR {sit.RvrSensor!.Label} {Fmt.N(sit.RvrM!.Value)} m {a.EntrySign} {Fmt.N(a.RvrBelowM!.Value)} m";
            }
            if (a.Enters(sit.CeilingFt, a.CeilingBelowFt))
            {
                return $"ceiling {Fmt.N(sit.CeilingFt!.Value)} ft ({sit.CeilingSensor}) {a.EntrySign} {Fmt.N(a.CeilingBelowFt!.Value)} ft";
            }
            return "active condition";
        }

        private string PreparationReason(Situation sit)
        {
            var p = Thresholds.Preparation;
            if (p.Enters(sit.RvrM, p.RvrBelowM))
            {
                return $"RVR {sit.RvrSensor!.Label} {Fmt.N(sit.RvrM!.Value)} m {p.EntrySign} {Fmt.N(p.RvrBelowM!.Value)} m";
            }
            if (p.Enters(sit.CeilingFt, p.CeilingBelowFt))
            {
                return $"ceiling {Fmt.N(sit.CeilingFt!.Value)} ft ({sit.CeilingSensor}) {p.EntrySign} {Fmt.N(p.CeilingBelowFt!.Value)} ft";
            }
            return sit.Forecast ? "deterioration forecast" : "preparation condition";
        }

        private string RecoveryReason(Situation sit, PhaseThresholds p, ConditionKind kind)
        {
            var parts = new List<string>();
            if (_model.RvrConfigured && (p.RvrRecoverM ?? p.RvrBelowM) is { } rvrLimit && sit.RvrM is { } rvr)
            {
                parts.Add($"RVR {Fmt.N(rvr)} m >= {Fmt.N(rvrLimit)} m");
            }
            if (_model.CeilingConfigured && (p.CeilingRecoverFt ?? p.CeilingBelowFt) is { } ceilingLimit && sit.CeilingFt is { } ceiling)
            {
                parts.Add($"ceiling {Fmt.N(ceiling)} ft >= {Fmt.N(ceilingLimit)} ft");
            }
            var name = kind == ConditionKind.RecoveryFromActive ? "recovery from active" : "recovery from preparation";
            return $"{name}: {string.Join(", ", parts)} held {Fmt.Span(_model.Dwell(kind))}";
        }

        private ConditionSnapshot Snapshot(Situation sit) => new(
            sit.At,
            sit.RvrM,
            sit.RvrSensor?.SensorId,
            sit.CeilingFt,
            sit.CeilingSensor,
            sit.Forecast,
            sit.RvrMissing.Count == 0 && sit.CeilingMissing.Count == 0 && (sit.RvrM is not null || !_model.RvrConfigured),
            Thresholds,
            sit.RvrSensor is { } g && State.Latest.TryGetValue(_model.Key(g.SensorId, ReadingKind.Rvr), out var r) ? r.Flags : ReadingFlags.None);

        private void Transition(Phase to, TransitionBy by, string? actor, string reason, Situation sit, DateTimeOffset? proposedAt, DateTimeOffset t)
        {
            var from = State.Phase;
            if (State.Pending is { } pending && proposedAt is null)
            {
                Events.Add(new ProposalWithdrawn(t, pending.From, pending.To, pending.ConditionMetAt, $"superseded by transition to {Fmt.Words(to)}"));
            }
            Events.Add(new PhaseTransition(t, from, to, by, actor, reason, Snapshot(sit), proposedAt));
            if (from == Phase.Normal)
            {
                var id = $"{_model.Profile.Aerodrome.Id}-{t.UtcDateTime:yyyyMMdd'T'HHmmss}Z";
                State = State with { Episode = new Episode(id, t, to), Items = [] };
                Events.Add(new EpisodeStarted(t, id));
            }
            State = State with { Phase = to, PhaseSince = t, Pending = null };
            if (from == Phase.Active && State.SafeguardsOverride is not null)
            {
                State = State with { SafeguardsOverride = null };
            }
            if (State.RelaxedAgainstConditions is { } relaxed && Severity(to) >= Severity(relaxed.From))
            {
                // the phase is back where the relaxation left it: phase and conditions agree again (R15)
                State = State with { RelaxedAgainstConditions = null };
            }
            if (State.Episode is { } episode && Severity(to) > Severity(episode.DeepestPhase))
            {
                State = State with { Episode = episode with { DeepestPhase = to } };
            }
            switch (to)
            {
                case Phase.Preparation:
                    if (from == Phase.Cancellation && DwellDone(ConditionKind.Active, t))
                    {
                        // re-instated while safeguards are open (R13): withdrawal stops as it would on entering active
                        CloseOpenItems(i => i.Phase == Phase.Cancellation, ItemStatus.Voided, t);
                    }
                    OpenItems(Phase.Preparation, t);
                    break;
                case Phase.Active:
                    if (from == Phase.Cancellation)
                    {
                        CloseOpenItems(i => i.Phase == Phase.Cancellation, ItemStatus.Voided, t);
                    }
                    if (from == Phase.Normal)
                    {
                        OpenItems(Phase.Preparation, t);
                    }
                    OpenItems(Phase.Active, t);
                    break;
                case Phase.Cancellation:
                    OpenItems(Phase.Cancellation, t);
                    break;
                case Phase.Normal:
                    CloseOpenItems(_ => true, ItemStatus.ClosedNotDone, t);
                    if (State.Episode is { } ended)
                    {
                        Events.Add(new EpisodeEnded(t, ended.Id, ended.Start, ended.DeepestPhase));
                    }
                    State = State with { Episode = null, Hold = null };
                    break;
                default:
                    break;
            }
        }
    }
}
