using OpsLvp.Core.Capability;
using OpsLvp.Core.Checklists;
using OpsLvp.Core.Presentation;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

public sealed partial class LvpEngine
{
    /// <summary>
    /// The capability inputs at <paramref name="t"/> (docs/engine.md R31–R35): facility statuses, RVR per direction and
    /// position from fresh in-service sensors or, where the sensor is silent or out of service, a fresh observer value,
    /// whether LVP are in force, and the directions in use.
    /// </summary>
    internal static CapabilityInputs CapabilityInputsAt(EngineModel model, EngineState state, DateTimeOffset t)
    {
        var profile = model.Profile;
        var observerAge = TimeSpan.FromSeconds(Math.Max(1, profile.Capability?.ObserverRvrMaxAgeSeconds ?? 600));
        var unserviceableSensors = new HashSet<string>(StringComparer.Ordinal);
        foreach (var f in profile.Capability?.Facilities ?? [])
        {
            if (f is { Kind: FacilityKind.RvrSensor, Sensor: { } sensorId } && state.Facilities.TryGetValue(f.Id, out var fs) && fs.Status == FacilityStatus.Unserviceable)
            {
                unserviceableSensors.Add(sensorId);
            }
        }
        var positions = new List<PositionValue>();
        var inUse = new HashSet<string>(StringComparer.Ordinal);
        foreach (var runway in profile.Runways)
        {
            if (runway?.Directions is not { Count: > 0 })
            {
                continue;
            }
            inUse.Add(EngineModel.DirectionInUse(runway, state));
            foreach (var sensor in model.Sensors.Values)
            {
                if (!SensorKinds.GivesRvr(sensor.Type) || sensor.Runway != runway.Id || sensor.Sites is null)
                {
                    continue;
                }
                foreach (var (direction, position) in sensor.Sites)
                {
                    PositionGap? gap = null;
                    double? value = null;
                    if (state.OutOfService.Contains(sensor.Id) || unserviceableSensors.Contains(sensor.Id))
                    {
                        gap = PositionGap.OutOfService;
                    }
                    else if (state.Latest.TryGetValue(model.Key(sensor.Id, ReadingKind.Rvr), out var r) && model.IsFresh(r, t))
                    {
                        value = r.Value;
                    }
                    else
                    {
                        gap = PositionGap.Silent;
                    }
                    // an observer's value never replaces a fresh sensor value (R35)
                    if (gap is not null && state.ObserverRvr.TryGetValue(ObserverRvr.KeyOf(direction, position), out var o) && t < o.At + observerAge)
                    {
                        positions.Add(new PositionValue(direction, position, o.ValueM, RvrSource.Observer, gap, o.Observer));
                    }
                    else
                    {
                        positions.Add(new PositionValue(direction, position, value, RvrSource.Sensor, gap));
                    }
                }
            }
        }
        return new CapabilityInputs(state.Facilities, positions, Standing(model, state, t), inUse);
    }

    /// <summary>
    /// Whether LVP are in force for operations that need them (R32): active with safeguards complete (or the profile's
    /// local choice not to need them); active declared over open safeguards, or preparation held for safeguards, is
    /// "safeguards incomplete"; any other phase is not in force.
    /// </summary>
    private static LvpStanding Standing(EngineModel model, EngineState state, DateTimeOffset t)
    {
        if (state.Phase == Phase.Active)
        {
            return !model.Profile.InForceNeedsSafeguards || Safeguards.AreComplete(state.Episode, state.Items)
                ? LvpStanding.InForce
                : LvpStanding.SafeguardsIncomplete;
        }
        return StatusBuilder.HeldForSafeguards(model, state, t) ? LvpStanding.SafeguardsIncomplete : LvpStanding.NotInForce;
    }

    private sealed partial class Run
    {
        /// <summary>Applies a capability command (R30, R34, R35), or returns why it cannot apply.</summary>
        private string? ApplyCapabilityCommand(EngineCommand command, DateTimeOffset now)
        {
            switch (command)
            {
                case SetFacilityStatus c:
                    var facility = _model.Profile.Capability!.Facilities.First(f => f is not null && f.Id == c.FacilityId);
                    var current = State.Facilities.TryGetValue(c.FacilityId, out var was) ? was.Status : FacilityStatus.Serviceable;
                    if (current == c.Status && (c.Status == FacilityStatus.Serviceable || was?.Reason == c.Reason))
                    {
                        return $"{facility.Name} is already {CapabilityWords.Status(c.Status)}";
                    }
                    State = State with
                    {
                        Facilities = c.Status == FacilityStatus.Serviceable
                            ? State.Facilities.Remove(c.FacilityId)
                            : State.Facilities.SetItem(c.FacilityId, new FacilityState(c.Status, c.Reason, c.Actor, now)),
                    };
                    Applied(now, c.Actor, "facility", $"{facility.Name} ({facility.Id}) {CapabilityWords.Status(c.Status)}{(c.Team is { } team ? $" (reported by team {team})" : "")}", c.Reason);
                    return null;
                case SetRunwayInUse c:
                    var runway = _model.Profile.Runways.First(r => r is not null && r.Id == c.RunwayId);
                    if (EngineModel.DirectionInUse(runway, State) == c.Direction)
                    {
                        return $"{c.Direction} is already the direction in use of runway {runway.Id}";
                    }
                    State = State with { DirectionsInUse = State.DirectionsInUse.SetItem(runway.Id, c.Direction) };
                    Applied(now, c.Actor, "runway_in_use", $"runway {runway.Id}: {c.Direction} in use", c.Reason);
                    return null;
                case EnterObserverRvr c:
                    var at = CapabilityInputsAt(_model, State, now).Positions
                        .FirstOrDefault(p => p.Direction == c.Direction && p.Position == c.Position);
                    if (at is null)
                    {
                        return $"no RVR sensor stands at {c.Direction} {CapabilityWords.Position(c.Position)}; an observer's RVR stands in for a silent or out-of-service sensor";
                    }
                    if (at.Gap is null)
                    {
                        return $"the {c.Direction} {CapabilityWords.Position(c.Position)} sensor is reporting ({DisplayFormat.Metres(at.ValueM ?? 0)}); an observer's RVR never replaces a fresh sensor value";
                    }
                    var entry = new ObserverRvr(c.Direction, c.Position, c.ValueM, c.Observer, c.Actor, now);
                    State = State with { ObserverRvr = State.ObserverRvr.SetItem(ObserverRvr.KeyOf(c.Direction, c.Position), entry) };
                    Applied(now, c.Actor, "observer_rvr", $"RVR {c.Direction} {CapabilityWords.Position(c.Position)} {c.ValueM.ToString(System.Globalization.CultureInfo.InvariantCulture)} m (observer {c.Observer})", c.Reason ?? "");
                    return null;
                default:
                    return $"unknown command {command.GetType().Name}";
            }
        }

        /// <summary>Observer values going stale are critical instants (R35).</summary>
        private void ConsiderCapability(Action<DateTimeOffset> consider)
        {
            if (_model.Profile.Capability is not { } capability || State.ObserverRvr.Count == 0)
            {
                return;
            }
            var age = TimeSpan.FromSeconds(Math.Max(1, capability.ObserverRvrMaxAgeSeconds));
            foreach (var o in State.ObserverRvr.Values)
            {
                consider(o.At + age);
            }
        }

        /// <summary>Recomputes the capability at <paramref name="t"/>; a change is an event and may start or end a downgrade (R36, R37).</summary>
        private void UpdateCapability(DateTimeOffset t)
        {
            if (_model.Profile.Capability is not { } profile)
            {
                return;
            }
            var inputs = CapabilityInputsAt(_model, State, t);
            var now = CapabilityEvaluator.Evaluate(profile, inputs);
            var before = State.Capability;
            var downgrades = State.CapabilityDowngrades;
            if (CapabilityEvaluator.Same(before, now))
            {
                return;
            }
            foreach (var after in now)
            {
                var key = after.Direction;
                if (!after.InUse)
                {
                    downgrades = downgrades.Remove(key);
                    continue;
                }
                if (downgrades.TryGetValue(key, out var baseline))
                {
                    if (CapabilityEvaluator.ApproachRank(after.BestApproach) >= CapabilityEvaluator.ApproachRank(baseline.BestApproach)
                        && (after.LvtoAvailable || !baseline.LvtoAvailable))
                    {
                        downgrades = downgrades.Remove(key);
                    }
                    continue;
                }
                var previous = before?.FirstOrDefault(b => b.Direction == key);
                if (previous is not null && previous.InUse && CapabilityEvaluator.IsDowngrade(previous, after))
                {
                    downgrades = downgrades.SetItem(key, new CapabilityBaseline(key, previous.BestApproach, previous.LvtoAvailable, CapabilityWords.Summary(previous)));
                }
            }
            State = State with { Capability = now, CapabilityDowngrades = downgrades };
            Events.Add(new CapabilityChanged(t, before ?? [], now));
        }

        /// <summary>The downgrade alarm of each direction in use below its level before the downgrade (R37).</summary>
        private void CapabilityAlarms(List<(string Key, AlarmKind Kind, string Message)> wanted)
        {
            if (State.CapabilityDowngrades.Count == 0 || State.Capability is not { } capability)
            {
                return;
            }
            foreach (var c in capability)
            {
                if (State.CapabilityDowngrades.TryGetValue(c.Direction, out var baseline))
                {
                    wanted.Add((AlarmKeys.CapabilityDowngrade(c.Direction), AlarmKind.CapabilityDowngrade,
                        $"runway {c.Direction} in use down from {baseline.Summary} to {CapabilityWords.Summary(c)}"));
                }
            }
        }
    }
}
