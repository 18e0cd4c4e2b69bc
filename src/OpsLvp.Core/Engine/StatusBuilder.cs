using OpsLvp.Core.Checklists;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>Builds <see cref="EngineStatus"/> from a state; reads the state, never changes it.</summary>
internal static class StatusBuilder
{
    public static EngineStatus Build(EngineModel model, EngineState state, DateTimeOffset now)
    {
        var sit = LvpEngine.Situate(model, state, now);
        MeasuredValue? Measured(string sensorId, ReadingKind kind, string label) =>
            state.Latest.TryGetValue(EngineState.SensorKey(sensorId, kind), out var r)
                ? new MeasuredValue(r.Value, sensorId, label, r.Time, (now - r.Time).TotalSeconds, !model.IsFresh(r, now), r.Flags)
                : null;
        var rvr = sit.RvrSensor is { } g ? Measured(g.SensorId, ReadingKind.Rvr, g.Label) : null;
        MeasuredValue? ceiling = null;
        if (sit.CeilingSensor is { } c)
        {
            ceiling = LvpEngine.CeilingKinds(model)
                .Select(k => Measured(c, k, c))
                .Where(m => m is { Stale: false })
                .MinBy(m => m!.Value);
        }
        var runways = new List<RunwayRvrStatus>();
        foreach (var (runway, _) in model.LvpRunways)
        {
            var direction = EngineModel.DirectionInUse(runway, state); // docs/engine.md R34
            var positions = new List<PositionRvr>();
            foreach (var position in Enum.GetValues<RvrPosition>())
            {
                var sensor = model.Sensors.Values.FirstOrDefault(s =>
                    SensorKinds.GivesRvr(s.Type) && s.Runway == runway.Id
                    && s.Sites is not null && s.Sites.TryGetValue(direction, out var p) && p == position);
                var label = $"{direction} {position.ToString().ToUpperInvariant()}";
                positions.Add(new PositionRvr(
                    position,
                    sensor?.Id,
                    sensor is null ? null : Measured(sensor.Id, ReadingKind.Rvr, label),
                    sensor is not null && state.OutOfService.Contains(sensor.Id),
                    model.Profile.GoverningPositions.Contains(position)));
            }
            runways.Add(new RunwayRvrStatus(runway.Id, direction, positions));
        }
        return new EngineStatus(
            now, state.Phase, state.PhaseSince, state.Episode, rvr, ceiling, model.CeilingConfigured, runways,
            model.Profile.Thresholds, state.DeteriorationForecast, state.Hold, state.Pending, state.Alarms,
            Waiting(model, state, sit, now))
        {
            SafeguardsComplete = Safeguards.AreComplete(state.Episode, state.Items),
            SafeguardsOutstanding = state.Episode is null ? [] : Safeguards.Outstanding(state.Items),
            ConditionsMetSafeguardsIncomplete = HeldForSafeguards(model, state, now),
            SafeguardsOverride = state.SafeguardsOverride,
            RelaxedAgainstConditions = state.RelaxedAgainstConditions,
            Capability = state.Capability,
            Facilities = state.Facilities,
            FacilityConfigs = model.Profile.Capability?.Facilities ?? [],
            ObserverRvr = state.ObserverRvr.Values.OrderBy(o => o.Direction, StringComparer.Ordinal).ThenBy(o => o.Position).ToList(),
            DirectionsInUse = model.Profile.Runways
                .Where(r => r?.Directions is { Count: > 0 })
                .GroupBy(r => r.Id, StringComparer.Ordinal)
                .ToDictionary(g => g.Key, g => EngineModel.DirectionInUse(g.First(), state), StringComparer.Ordinal),
            RunwayDirections = model.Profile.Runways
                .Where(r => r?.Directions is { Count: > 0 })
                .GroupBy(r => r.Id, StringComparer.Ordinal)
                .ToDictionary(g => g.Key, g => (IReadOnlyList<string>)g.First().Directions.ToList(), StringComparer.Ordinal),
        };
    }

    /// <summary>Preparation held below active by open safeguards while the active condition has held its dwell (R13).</summary>
    internal static bool HeldForSafeguards(EngineModel model, EngineState state, DateTimeOffset now) =>
        model.Profile.InForceNeedsSafeguards
        && state.Phase == Phase.Preparation
        && state.HoldingSince.TryGetValue(ConditionKind.Active, out var since)
        && (state.EscalationMeasuredFrom is { } f && f > since ? f : since) + model.Dwell(ConditionKind.Active) <= now
        && Safeguards.Outstanding(state.Items).Count > 0;

    private static List<WaitingFor> Waiting(EngineModel model, EngineState state, Situation sit, DateTimeOffset now)
    {
        var waiting = new List<WaitingFor>();
        void Dwell(ConditionKind kind, WaitKind wait, string name)
        {
            if (!state.HoldingSince.TryGetValue(kind, out var since))
            {
                return;
            }
            var start = kind is ConditionKind.Active or ConditionKind.Preparation && state.EscalationMeasuredFrom is { } f && f > since ? f : since;
            var held = now > start ? now - start : TimeSpan.Zero;
            var required = model.Dwell(kind);
            if (held < required)
            {
                waiting.Add(new WaitingFor(wait, $"{name} held {Fmt.Of(held, required)}", held.TotalSeconds, required.TotalSeconds, []));
            }
        }
        void Blocked()
        {
            var missing = sit.RvrMissing.Concat(sit.CeilingMissing).ToList();
            if (missing.Count > 0)
            {
                waiting.Add(new WaitingFor(WaitKind.RecoveryBlocked, $"recovery blocked: no fresh reading from {string.Join(", ", missing)}", null, null, missing));
            }
            else if (model.RvrConfigured && sit.RvrM is null)
            {
                waiting.Add(new WaitingFor(WaitKind.RecoveryBlocked, "recovery blocked: governing RVR unknown (all governing sensors out of service)", null, null, []));
            }
        }
        if (state.Pending is { } pending)
        {
            waiting.Add(new WaitingFor(
                WaitKind.Confirmation,
                $"waiting for confirmation: {Fmt.Change(pending.From, pending.To)} proposed {Fmt.Time(pending.ConditionMetAt)} ({pending.Reason})",
                null, null, []));
        }
        if (state.Hold is { } hold)
        {
            waiting.Add(new WaitingFor(WaitKind.Hold, $"hold: {Fmt.Words(hold.Phase)} declared by {hold.Actor}; no automatic relaxation below it until released", null, null, []));
        }
        switch (state.Phase)
        {
            case Phase.Normal:
                Dwell(ConditionKind.Active, WaitKind.EscalationDwell, "active condition");
                Dwell(ConditionKind.Preparation, WaitKind.EscalationDwell, "preparation condition");
                break;
            case Phase.Preparation:
                if (HeldForSafeguards(model, state, now))
                {
                    var safeguards = Safeguards.Outstanding(state.Items);
                    waiting.Add(new WaitingFor(WaitKind.Safeguards, $"{LvpEngine.SafeguardsIncompleteHeadline}: {string.Join(", ", safeguards)} open", null, null, safeguards));
                }
                Dwell(ConditionKind.Active, WaitKind.EscalationDwell, "active condition");
                Dwell(ConditionKind.RecoveryFromPreparation, WaitKind.RecoveryDwell, "recovery from preparation");
                Blocked();
                break;
            case Phase.Active:
                Dwell(ConditionKind.RecoveryFromActive, WaitKind.RecoveryDwell, "recovery from active");
                Blocked();
                break;
            case Phase.Cancellation:
                var open = state.Items.Where(i => i.Phase == Phase.Cancellation && i.Mandatory && i.Status == ItemStatus.Open).Select(i => i.ItemId).ToList();
                if (open.Count > 0)
                {
                    waiting.Add(new WaitingFor(WaitKind.CancellationItems, $"cancellation: {open.Count} mandatory item{(open.Count == 1 ? "" : "s")} open", null, null, open));
                }
                Dwell(ConditionKind.Active, WaitKind.EscalationDwell, "active condition (re-instatement)");
                Dwell(ConditionKind.RecoveryFromPreparation, WaitKind.RecoveryDwell, "recovery from preparation");
                Blocked();
                break;
            default:
                break;
        }
        return waiting;
    }
}
