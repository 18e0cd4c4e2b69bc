using System.Collections.Immutable;
using System.Runtime.CompilerServices;
using OpsLvp.Core.Checklists;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>
/// The LVP engine of DESIGN §3 (R1–R11) as a pure function (state, inputs, now) → (state, events): no clock,
/// no I/O, the same in live runs and replays. Time semantics:
/// <list type="bullet">
/// <item>A reading is fresh from its time until, exclusive, time + the kind's maximum age (profile; 120 s when
/// the profile gives none). A condition that depends on it starts holding when the reading is applied (its
/// arrival, <c>now</c>), and stops at the stale instant.</item>
/// <item>Between <see cref="EngineState.EvaluatedAt"/> and <c>now</c> the engine steps through every critical
/// instant (dwell completions, readings going stale, items falling due) in time order and stamps events with
/// that exact instant (R7), so one evaluation at the end gives the events of evaluating every second.</item>
/// <item>Then the inputs are applied in order at <c>now</c> (consecutive readings as one batch, commands one by
/// one, each followed by a re-evaluation at <c>now</c>). A <c>now</c> earlier than the state's instant is
/// treated as the state's instant.</item>
/// </list>
/// Entry conditions are strict (value &lt; below), recovery inclusive (value ≥ recover); unknown inputs can
/// escalate on what is known and never relax (R5).
/// </summary>
public sealed class LvpEngine(AerodromeProfile profile)
{
    private const int MaxTransitionsPerInstant = 8;

    private readonly EngineModel _model = new(profile);

    /// <summary>
    /// States an engine returned whose final step at their <see cref="EngineState.EvaluatedAt"/> changed nothing,
    /// with the profile applied: a step is a pure function of (profile, state, instant), so stepping such a state
    /// again at that instant with the same profile changes nothing either and is skipped. Keyed by reference
    /// (states and profiles are immutable); entries go with their states.
    /// </summary>
    private static readonly ConditionalWeakTable<EngineState, Tuple<AerodromeProfile, DateTimeOffset>> Settled = new();

    /// <summary>The profile this engine applies.</summary>
    public AerodromeProfile Profile => _model.Profile;

    /// <summary>The state at start: normal, nothing known, monitoring from <paramref name="now"/>.</summary>
    public EngineState Initial(DateTimeOffset now) => new()
    {
        EvaluatedAt = now,
        PhaseSince = now,
        MonitoringSince = now,
    };

    /// <summary>Advances <paramref name="state"/> to <paramref name="now"/>, then applies <paramref name="inputs"/> at <paramref name="now"/>.</summary>
    public EngineResult Evaluate(EngineState state, IReadOnlyList<EngineInput> inputs, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(inputs);
        var run = new Run(_model, state);
        if (Settled.TryGetValue(state, out var settled) && ReferenceEquals(settled.Item1, _model.Profile))
        {
            run.Settled(settled.Item2);
        }
        var start = state.EvaluatedAt;
        if (now < start)
        {
            now = start;
        }
        run.Step(start);
        var t = start;
        // NextCriticalInstant looks in (t, now]: empty once t reaches now, so it is not asked then
        while (t < now && run.NextCriticalInstant(t, now) is { } next)
        {
            run.Step(next);
            t = next;
        }
        run.Step(now);
        var pendingReadings = false;
        foreach (var input in inputs)
        {
            switch (input)
            {
                case ReadingInput r:
                    pendingReadings |= run.Accept(r.Reading, now);
                    break;
                case EngineCommand c:
                    if (pendingReadings)
                    {
                        run.Step(now);
                        pendingReadings = false;
                    }
                    run.Apply(c, now);
                    run.Step(now);
                    break;
                default:
                    break;
            }
        }
        run.Step(now);
        var isSettled = run.IsSettled(now);
        run.State = run.State with { EvaluatedAt = now };
        if (isSettled)
        {
            Settled.AddOrUpdate(run.State, Tuple.Create(_model.Profile, now));
        }
        return new EngineResult(run.State, run.Events);
    }

    /// <summary>What displays show: governing values with freshness, per-runway RVR, thresholds, and what the engine waits for.</summary>
    public EngineStatus Describe(EngineState state, DateTimeOffset now) => StatusBuilder.Build(_model, state, now);

    /// <summary>The conditions at <paramref name="t"/> (internal: used by status and tests through the engine).</summary>
    internal static Situation Situate(EngineModel model, EngineState state, DateTimeOffset t)
    {
        var thresholds = model.Profile.Thresholds;
        double? rvr = null;
        GoverningSensor? rvrSensor = null;
        var rvrMissing = new List<string>();
        var governing = model.Governing;
        var governingKeys = model.GoverningRvrKeys;
        for (var gi = 0; gi < governing.Count; gi++)
        {
            var g = governing[gi];
            if (state.OutOfService.Contains(g.SensorId))
            {
                continue;
            }
            if (state.Latest.TryGetValue(governingKeys[gi], out var r) && model.IsFresh(r, t))
            {
                if (rvr is null || r.Value < rvr)
                {
                    rvr = r.Value;
                    rvrSensor = g;
                }
            }
            else if (!rvrMissing.Contains(g.SensorId))
            {
                rvrMissing.Add(g.SensorId);
            }
        }
        double? ceiling = null;
        string? ceilingSensor = null;
        var ceilingMissing = new List<string>();
        var ceilometers = model.Ceilometers;
        for (var ci = 0; ci < ceilometers.Count; ci++)
        {
            var id = ceilometers[ci];
            if (state.OutOfService.Contains(id))
            {
                continue;
            }
            var any = false;
            foreach (var key in model.CeilometerKeys[ci])
            {
                if (state.Latest.TryGetValue(key, out var r) && model.IsFresh(r, t))
                {
                    any = true;
                    if (ceiling is null || r.Value < ceiling)
                    {
                        ceiling = r.Value;
                        ceilingSensor = id;
                    }
                }
            }
            if (!any)
            {
                ceilingMissing.Add(id);
            }
        }
        var forecast = state.DeteriorationForecast;
        var active = Below(rvr, thresholds.Active.RvrBelowM) || Below(ceiling, thresholds.Active.CeilingBelowFt);
        var preparation = forecast || Below(rvr, thresholds.Preparation.RvrBelowM) || Below(ceiling, thresholds.Preparation.CeilingBelowFt);
        bool Recovered(PhaseThresholds p)
        {
            var rvrLimit = p.RvrRecoverM ?? p.RvrBelowM;
            var ceilingLimit = p.CeilingRecoverFt ?? p.CeilingBelowFt;
            var rvrOk = !model.RvrConfigured || rvrLimit is null || (rvr is { } v && rvrMissing.Count == 0 && v >= rvrLimit);
            var ceilingOk = !model.CeilingConfigured || ceilingLimit is null || (ceiling is { } c && ceilingMissing.Count == 0 && c >= ceilingLimit);
            return rvrOk && ceilingOk;
        }
        return new Situation(
            t, rvr, rvrSensor, rvrMissing, ceiling, ceilingSensor, ceilingMissing, forecast,
            active, preparation, Recovered(thresholds.Active), !forecast && Recovered(thresholds.Preparation));
    }

    internal static IEnumerable<ReadingKind> CeilingKinds(EngineModel model) => model.CeilingKinds;

    private static bool Below(double? value, double? threshold) => value is { } v && threshold is { } limit && v < limit;

    /// <summary>One evaluation: the state being built and the events so far.</summary>
    private sealed class Run(EngineModel model, EngineState state)
    {
        private readonly EngineModel _model = model;

        public EngineState State { get; set; } = state;

        public List<EngineEvent> Events { get; } = [];

        private static readonly ConditionalWeakTable<ChecklistItemState, Tuple<string, string>> OverdueTexts = new();

        private ThresholdSet Thresholds => _model.Profile.Thresholds;

        // The last state a step left unchanged, and its instant: stepping it again there is a no-op.
        private EngineState? _settledState;
        private DateTimeOffset _settledAt;

        /// <summary>Marks the current state as one a step at <paramref name="t"/> leaves unchanged.</summary>
        public void Settled(DateTimeOffset t)
        {
            _settledState = State;
            _settledAt = t;
        }

        /// <summary>Whether a step at <paramref name="t"/> is known to leave the current state unchanged.</summary>
        public bool IsSettled(DateTimeOffset t) => ReferenceEquals(State, _settledState) && _settledAt == t;

        // ---------------------------------------------------------------- time

        /// <summary>The earliest instant in (after, until] at which something can change without an input.</summary>
        public DateTimeOffset? NextCriticalInstant(DateTimeOffset after, DateTimeOffset until)
        {
            DateTimeOffset? best = null;
            void Consider(DateTimeOffset c)
            {
                if (c > after && c <= until && (best is null || c < best))
                {
                    best = c;
                }
            }
            foreach (var r in State.Latest.Values)
            {
                Consider(r.Time + _model.MaxAge(r.Kind));
            }
            foreach (var sensor in _model.SensorEntries)
            {
                if (!HasReadings(sensor))
                {
                    Consider(MonitoringSince + sensor.PrimaryMaxAge);
                }
            }
            foreach (var (kind, since) in State.HoldingSince)
            {
                Consider(DwellStart(kind, since) + _model.Dwell(kind));
            }
            foreach (var item in State.Items)
            {
                if (item.Status == ItemStatus.Open)
                {
                    Consider(item.DueAt);
                }
            }
            return best;
        }

        private DateTimeOffset MonitoringSince => State.MonitoringSince ?? State.PhaseSince;

        private bool HasReadings(EngineModel.SensorEntry sensor)
        {
            foreach (var key in sensor.AllKeys)
            {
                if (State.Latest.ContainsKey(key))
                {
                    return true;
                }
            }
            return false;
        }

        /// <summary>Escalation dwells are measured from no earlier than the last manual relaxation (R9).</summary>
        private DateTimeOffset DwellStart(ConditionKind kind, DateTimeOffset since) =>
            kind is ConditionKind.Active or ConditionKind.Preparation && State.EscalationMeasuredFrom is { } from && from > since
                ? from
                : since;

        private bool DwellDone(ConditionKind kind, DateTimeOffset t) =>
            State.HoldingSince.TryGetValue(kind, out var since) && DwellStart(kind, since) + _model.Dwell(kind) <= t;

        /// <summary>Brings conditions, transitions, pending and alarms up to date at <paramref name="t"/>; idempotent.</summary>
        public void Step(DateTimeOffset t)
        {
            if (IsSettled(t))
            {
                return;
            }
            var before = State;
            StepOnce(t);
            if (ReferenceEquals(State, before))
            {
                // nothing changed (every event comes with a state change): the state is a fixed point at t
                Settled(t);
            }
        }

        private void StepOnce(DateTimeOffset t)
        {
            for (var i = 0; i < MaxTransitionsPerInstant; i++)
            {
                var sit = SituateNow(t);
                UpdateHolding(sit, t);
                var desired = Desired(sit, t);
                if (State.Pending is { } pending && (desired is null || desired.Value.To != pending.To))
                {
                    var why = desired is { } other
                        ? $"superseded: {Fmt.Name(pending.From)} -> {Fmt.Name(other.To)} is due instead"
                        : State.Hold is { } hold && Severity(pending.To) < Severity(hold.Phase)
                            ? $"hold on {Fmt.Name(hold.Phase)} declared by {hold.Actor}"
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
            ReconcileAlarms(SituateNow(t), t);
        }

        // The last situation computed in this run and what it was computed from (Situate reads only these).
        private Situation? _sit;
        private ImmutableDictionary<string, Reading>? _sitLatest;
        private ImmutableHashSet<string>? _sitOutOfService;
        private bool _sitForecast;

        /// <summary><see cref="Situate"/> at <paramref name="t"/>, reusing the last result when its inputs are the same objects.</summary>
        private Situation SituateNow(DateTimeOffset t)
        {
            if (_sit is { } last && last.At == t && ReferenceEquals(_sitLatest, State.Latest)
                && ReferenceEquals(_sitOutOfService, State.OutOfService) && _sitForecast == State.DeteriorationForecast)
            {
                return last;
            }
            _sit = Situate(_model, State, t);
            _sitLatest = State.Latest;
            _sitOutOfService = State.OutOfService;
            _sitForecast = State.DeteriorationForecast;
            return _sit;
        }

        private void UpdateHolding(Situation sit, DateTimeOffset t)
        {
            var holding = State.HoldingSince;
            foreach (var kind in EngineModel.AllConditions)
            {
                var holds = sit.Holds(kind);
                if (holds && !holding.ContainsKey(kind))
                {
                    holding = holding.SetItem(kind, t);
                }
                else if (!holds && holding.ContainsKey(kind))
                {
                    holding = holding.Remove(kind);
                }
            }
            if (!ReferenceEquals(holding, State.HoldingSince))
            {
                State = State with { HoldingSince = holding };
            }
        }

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
                        return (Phase.Active, ActiveReason(sit));
                    }
                    if (DwellDone(ConditionKind.Preparation, t))
                    {
                        return (Phase.Preparation, PreparationReason(sit));
                    }
                    return null;
                case Phase.Preparation:
                    if (DwellDone(ConditionKind.Active, t))
                    {
                        return (Phase.Active, ActiveReason(sit));
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
                        return (Phase.Active, "re-instated: " + ActiveReason(sit));
                    }
                    if (!State.Items.Any(i => i.Phase == Phase.Cancellation && i.Mandatory && i.Status == ItemStatus.Open))
                    {
                        var recovered = DwellDone(ConditionKind.RecoveryFromPreparation, t) && !HoldAtLeast(Phase.Preparation);
                        var what = _model.ItemsOf(Phase.Cancellation).Any(i => i.Mandatory)
                            ? "mandatory cancellation items done"
                            : "no mandatory cancellation items";
                        return recovered
                            ? (Phase.Normal, $"{what}; recovery from preparation held {Fmt.Span(_model.Dwell(ConditionKind.RecoveryFromPreparation))}")
                            : (Phase.Preparation, $"{what}; {(HoldAtLeast(Phase.Preparation) ? "preparation hold in force" : "recovery from preparation not yet held its dwell")}");
                    }
                    return null;
                default:
                    return null;
            }
        }

        // ---------------------------------------------------------------- reasons

        private string ActiveReason(Situation sit)
        {
            var a = Thresholds.Active;
            if (Below(sit.RvrM, a.RvrBelowM))
            {
                return $"RVR {sit.RvrSensor!.Label} {Fmt.N(sit.RvrM!.Value)} m < {Fmt.N(a.RvrBelowM!.Value)} m";
            }
            if (Below(sit.CeilingFt, a.CeilingBelowFt))
            {
                return $"ceiling {Fmt.N(sit.CeilingFt!.Value)} ft ({sit.CeilingSensor}) < {Fmt.N(a.CeilingBelowFt!.Value)} ft";
            }
            return "active condition";
        }

        private string PreparationReason(Situation sit)
        {
            var p = Thresholds.Preparation;
            if (Below(sit.RvrM, p.RvrBelowM))
            {
                return $"RVR {sit.RvrSensor!.Label} {Fmt.N(sit.RvrM!.Value)} m < {Fmt.N(p.RvrBelowM!.Value)} m";
            }
            if (Below(sit.CeilingFt, p.CeilingBelowFt))
            {
                return $"ceiling {Fmt.N(sit.CeilingFt!.Value)} ft ({sit.CeilingSensor}) < {Fmt.N(p.CeilingBelowFt!.Value)} ft";
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
            Thresholds);

        // ---------------------------------------------------------------- transitions and checklists

        private void Transition(Phase to, TransitionBy by, string? actor, string reason, Situation sit, DateTimeOffset? proposedAt, DateTimeOffset t)
        {
            var from = State.Phase;
            if (State.Pending is { } pending && proposedAt is null)
            {
                Events.Add(new ProposalWithdrawn(t, pending.From, pending.To, pending.ConditionMetAt, $"superseded by transition to {Fmt.Name(to)}"));
            }
            Events.Add(new PhaseTransition(t, from, to, by, actor, reason, Snapshot(sit), proposedAt));
            if (from == Phase.Normal)
            {
                var id = $"{_model.Profile.Aerodrome.Id}-{t.UtcDateTime:yyyyMMdd'T'HHmmss}Z";
                State = State with { Episode = new Episode(id, t, to), Items = [] };
                Events.Add(new EpisodeStarted(t, id));
            }
            State = State with { Phase = to, PhaseSince = t, Pending = null };
            if (State.Episode is { } episode && Severity(to) > Severity(episode.DeepestPhase))
            {
                State = State with { Episode = episode with { DeepestPhase = to } };
            }
            switch (to)
            {
                case Phase.Preparation:
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

        /// <summary>Opens the phase's items; an item already open stays as it is, a done or closed one gets a fresh instance.</summary>
        private void OpenItems(Phase phase, DateTimeOffset t)
        {
            var items = State.Items;
            var opened = new List<string>();
            foreach (var config in _model.ItemsOf(phase))
            {
                if (config is null || string.IsNullOrEmpty(config.Id) || opened.Contains(config.Id))
                {
                    continue;
                }
                if (Current(items, config.Id) is { Status: ItemStatus.Open })
                {
                    continue;
                }
                var due = t + TimeSpan.FromMinutes(Math.Max(0, config.DueWithinMinutes));
                items = items.Add(new ChecklistItemState(config.Id, phase, config.Team, config.Mandatory, t, due, ItemStatus.Open));
                opened.Add(config.Id);
            }
            if (opened.Count > 0)
            {
                State = State with { Items = items };
                Events.Add(new ChecklistOpened(t, phase, opened));
            }
        }

        private void CloseOpenItems(Func<ChecklistItemState, bool> which, ItemStatus status, DateTimeOffset t)
        {
            var closed = new List<string>();
            var items = State.Items.Select(i =>
            {
                if (i.Status == ItemStatus.Open && which(i))
                {
                    closed.Add(i.ItemId);
                    return i with { Status = status };
                }
                return i;
            }).ToImmutableList();
            if (closed.Count > 0)
            {
                State = State with { Items = items };
                Events.Add(new ItemsClosed(t, status, closed));
            }
        }

        /// <summary>The latest instance of an item in the episode (ticks act on it).</summary>
        private static ChecklistItemState? Current(ImmutableList<ChecklistItemState> items, string itemId)
        {
            for (var i = items.Count - 1; i >= 0; i--)
            {
                if (items[i].ItemId == itemId)
                {
                    return items[i];
                }
            }
            return null;
        }

        // ---------------------------------------------------------------- alarms

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
                wanted.Add((AlarmKeys.Pending, AlarmKind.PendingTransition, $"confirm {Fmt.Name(p.From)} -> {Fmt.Name(p.To)}: {p.Reason}"));
            }
            if (State.Episode is not null && sit.Active && !Safeguards.AreComplete(State.Episode, State.Items))
            {
                wanted.Add((AlarmKeys.SafeguardsIncomplete, AlarmKind.SafeguardsIncomplete, "active condition holds while mandatory preparation items are open"));
            }
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

        // ---------------------------------------------------------------- readings (R1, R2)

        /// <summary>Screens a reading; returns true when it reached the state.</summary>
        public bool Accept(Reading reading, DateTimeOffset now)
        {
            if (Screen(reading, now) is { } rejection)
            {
                Events.Add(new ReadingRejected(now, reading, rejection.Reason, rejection.Detail));
                return false;
            }
            State = State with { Latest = State.Latest.SetItem(_model.Key(reading.SensorId, reading.Kind), reading) };
            return true;
        }

        private (RejectReason Reason, string Detail)? Screen(Reading reading, DateTimeOffset now)
        {
            if (reading is null)
            {
                return (RejectReason.Malformed, "no reading");
            }
            if (ReadingScreen.Check(reading, _model.SensorOf(reading.SensorId), now, _model.FutureSkew) is { } stateless)
            {
                return stateless;
            }
            if (State.Latest.TryGetValue(_model.Key(reading.SensorId, reading.Kind), out var latest))
            {
                if (reading.Time == latest.Time)
                {
                    return (RejectReason.Duplicate, $"{reading.SensorId} {reading.Kind} at {Fmt.Time(reading.Time)} already taken");
                }
                if (reading.Time < latest.Time)
                {
                    return (RejectReason.OlderThanLatest, $"older than the latest {reading.SensorId} {reading.Kind} at {Fmt.Time(latest.Time)}; ignored for state");
                }
            }
            return null;
        }

        // ---------------------------------------------------------------- commands (R9–R11)

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

        private string? Tick(TickItem c, DateTimeOffset now)
        {
            if (c.ItemId is null || !_model.ItemConfigs.TryGetValue(c.ItemId, out var config))
            {
                return $"unknown item '{c.ItemId}'";
            }
            if (c.Team != config.Item.Team)
            {
                return $"item {c.ItemId} belongs to team {config.Item.Team}, not {c.Team}";
            }
            var item = Current(State.Items, c.ItemId);
            switch (item?.Status)
            {
                case null:
                    return $"item {c.ItemId} is not open: its {Fmt.Name(config.Phase)} checklist has not been opened";
                case ItemStatus.Done:
                    return $"item {c.ItemId} already done by {item.Tick!.User} at {Fmt.Time(item.Tick.At)}";
                case ItemStatus.ClosedNotDone:
                    return $"item {c.ItemId} is closed: its episode ended";
                case ItemStatus.Voided:
                    return $"item {c.ItemId} was voided by re-instatement";
                default:
                    break;
            }
            var tick = new ItemTick(c.Actor, c.Team, now, string.IsNullOrWhiteSpace(c.Note) ? null : c.Note);
            State = State with { Items = State.Items.Replace(item, item with { Status = ItemStatus.Done, Tick = tick }) };
            Events.Add(new ItemTicked(now, c.ItemId, tick));
            return null;
        }

        private string? Untick(UntickItem c, DateTimeOffset now)
        {
            if (c.ItemId is null || !_model.ItemConfigs.ContainsKey(c.ItemId))
            {
                return $"unknown item '{c.ItemId}'";
            }
            if (Blank(c.Reason))
            {
                return "a reason is required to undo a tick";
            }
            var item = Current(State.Items, c.ItemId);
            if (item is not { Status: ItemStatus.Done, Tick: { } tick })
            {
                return $"item {c.ItemId} is not done";
            }
            if (State.Episode is null)
            {
                return $"item {c.ItemId} belongs to an ended episode";
            }
            State = State with { Items = State.Items.Replace(item, item with { Status = ItemStatus.Open, Tick = null }) };
            Events.Add(new ItemUnticked(now, c.ItemId, c.Actor, c.Reason, tick));
            return null;
        }
    }
}
