using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Capability;

/// <summary>
/// Pure evaluation of what each runway direction supports (docs/engine.md R31–R33): for every operation the profile
/// offers, available or not with every reason. Never better than its inputs allow: a facility that is not
/// serviceable (degraded only where the operation accepts it), a required RVR position without a value, an RVR below
/// the minimum (inclusive: RVR ≥ minimum meets it), or LVP not in force where the operation needs them, each makes the
/// operation not available.
/// </summary>
public static class CapabilityEvaluator
{
    /// <summary>Approach categories from best to least.</summary>
    private static readonly OperationKind[] ApproachOrder = [OperationKind.CatIII, OperationKind.CatII, OperationKind.CatI];

    /// <summary>
    /// The capability per runway direction named by an operation: directions in use first, then the others, each in
    /// the order of their first operation in the profile.
    /// </summary>
    public static IReadOnlyList<RunwayCapability> Evaluate(CapabilityProfile profile, CapabilityInputs inputs)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(inputs);
        var facilities = new Dictionary<string, FacilityConfig>(StringComparer.Ordinal);
        foreach (var f in profile.Facilities)
        {
            if (f is not null && !string.IsNullOrEmpty(f.Id))
            {
                facilities.TryAdd(f.Id, f);
            }
        }
        var positions = new Dictionary<(string, RvrPosition), PositionValue>();
        foreach (var p in inputs.Positions)
        {
            positions.TryAdd((p.Direction, p.Position), p);
        }
        var directions = new List<string>();
        foreach (var op in profile.Operations)
        {
            if (op is not null && op.Direction is not null && !directions.Contains(op.Direction))
            {
                directions.Add(op.Direction);
            }
        }
        var ordered = directions.Where(inputs.DirectionsInUse.Contains).Concat(directions.Where(d => !inputs.DirectionsInUse.Contains(d)));
        var result = new List<RunwayCapability>();
        foreach (var direction in ordered)
        {
            var ops = new List<OperationCapability>();
            foreach (var op in profile.Operations)
            {
                if (op is not null && op.Direction == direction)
                {
                    ops.Add(EvaluateOperation(op, facilities, positions, inputs));
                }
            }
            OperationKind? best = null;
            foreach (var kind in ApproachOrder)
            {
                if (ops.Any(o => o.Kind == kind && o.Available))
                {
                    best = kind;
                    break;
                }
            }
            var lvto = ops.Where(o => o.Kind == OperationKind.Lvto).ToList();
            result.Add(new RunwayCapability(direction, inputs.DirectionsInUse.Contains(direction), best, lvto.Count > 0, lvto.Any(o => o.Available), ops));
        }
        return result;
    }

    /// <summary>One operation with every reason it is not available (facilities, then LVP, then RVR positions, in profile order).</summary>
    public static OperationCapability EvaluateOperation(
        OperationConfig op,
        IReadOnlyDictionary<string, FacilityConfig> facilities,
        IReadOnlyDictionary<(string Direction, RvrPosition Position), PositionValue> positions,
        CapabilityInputs inputs)
    {
        ArgumentNullException.ThrowIfNull(op);
        ArgumentNullException.ThrowIfNull(facilities);
        ArgumentNullException.ThrowIfNull(positions);
        ArgumentNullException.ThrowIfNull(inputs);
        var reasons = new List<CapabilityReason>();
        foreach (var id in op.Facilities ?? [])
        {
            if (id is null || !facilities.TryGetValue(id, out var facility))
            {
                reasons.Add(new CapabilityReason(ReasonKind.FacilityUnknown, Facility: id, FacilityName: id));
                continue;
            }
            if (!inputs.Facilities.TryGetValue(id, out var state))
            {
                continue;
            }
            if (state.Status == FacilityStatus.Unserviceable)
            {
                reasons.Add(new CapabilityReason(ReasonKind.FacilityUnserviceable, id, facility.Name, state.Reason));
            }
            else if (state.Status == FacilityStatus.Degraded && !(op.AcceptDegraded ?? []).Contains(id))
            {
                reasons.Add(new CapabilityReason(ReasonKind.FacilityDegraded, id, facility.Name, state.Reason));
            }
        }
        if (op.NeedsLvp && inputs.Lvp != LvpStanding.InForce)
        {
            reasons.Add(new CapabilityReason(inputs.Lvp == LvpStanding.SafeguardsIncomplete ? ReasonKind.LvpSafeguardsIncomplete : ReasonKind.LvpNotInForce));
        }
        var observer = false;
        foreach (var need in op.Rvr ?? [])
        {
            if (need is null)
            {
                continue;
            }
            if (!positions.TryGetValue((op.Direction, need.Position), out var at) || at.ValueM is not { } value)
            {
                var gap = at?.Gap ?? PositionGap.NoSensor;
                reasons.Add(new CapabilityReason(
                    gap switch
                    {
                        PositionGap.Silent => ReasonKind.RvrPositionSilent,
                        PositionGap.OutOfService => ReasonKind.RvrPositionOutOfService,
                        _ => ReasonKind.RvrPositionNoSensor,
                    },
                    Position: need.Position,
                    MinimumM: need.MinimumM));
                continue;
            }
            if (!(value >= need.MinimumM))
            {
                reasons.Add(new CapabilityReason(ReasonKind.RvrBelowMinimum, Position: need.Position, ValueM: value, MinimumM: need.MinimumM, Source: at.Source));
                continue;
            }
            observer |= at.Source == RvrSource.Observer;
        }
        return new OperationCapability(op.Kind, reasons.Count == 0, reasons) { UsesObserverRvr = observer && reasons.Count == 0 };
    }

    /// <summary>Whether two capability lists say the same (directions, in-use, headline, every operation and reason).</summary>
    public static bool Same(IReadOnlyList<RunwayCapability>? a, IReadOnlyList<RunwayCapability>? b)
    {
        if (ReferenceEquals(a, b))
        {
            return true;
        }
        if (a is null || b is null || a.Count != b.Count)
        {
            return false;
        }
        for (var i = 0; i < a.Count; i++)
        {
            var x = a[i];
            var y = b[i];
            if (x.Direction != y.Direction || x.InUse != y.InUse || x.BestApproach != y.BestApproach
                || x.LvtoOffered != y.LvtoOffered || x.LvtoAvailable != y.LvtoAvailable || x.Operations.Count != y.Operations.Count)
            {
                return false;
            }
            for (var j = 0; j < x.Operations.Count; j++)
            {
                var p = x.Operations[j];
                var q = y.Operations[j];
                if (p.Kind != q.Kind || p.Available != q.Available || p.UsesObserverRvr != q.UsesObserverRvr || !p.Reasons.SequenceEqual(q.Reasons))
                {
                    return false;
                }
            }
        }
        return true;
    }

    /// <summary>Whether <paramref name="after"/> is worse than <paramref name="before"/>: a lower best approach category, or LVTO lost.</summary>
    public static bool IsDowngrade(RunwayCapability before, RunwayCapability after)
    {
        ArgumentNullException.ThrowIfNull(before);
        ArgumentNullException.ThrowIfNull(after);
        return ApproachRank(after.BestApproach) < ApproachRank(before.BestApproach) || (before.LvtoAvailable && !after.LvtoAvailable);
    }

    /// <summary>0 for none, 1 CAT I, 2 CAT II, 3 CAT III.</summary>
    public static int ApproachRank(OperationKind? kind) => kind switch
    {
        OperationKind.CatIII => 3,
        OperationKind.CatII => 2,
        OperationKind.CatI => 1,
        _ => 0,
    };
}
