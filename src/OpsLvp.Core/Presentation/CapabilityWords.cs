using OpsLvp.Core.Capability;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Presentation;

/// <summary>How every screen, export and audit entry words a runway capability (docs/capability.md).</summary>
public static class CapabilityWords
{
    /// <summary>"CAT I", "CAT II", "CAT III", "LVTO".</summary>
    public static string Operation(OperationKind kind) => kind switch
    {
        OperationKind.CatI => "CAT I",
        OperationKind.CatII => "CAT II",
        OperationKind.CatIII => "CAT III",
        OperationKind.Lvto => "LVTO",
        _ => kind.ToString(),
    };

    /// <summary>The best approach category, or "no CAT approach" when none is available.</summary>
    public static string BestApproach(OperationKind? kind) => kind is { } k ? Operation(k) : "no CAT approach";

    /// <summary>"LVTO available", "LVTO not available", or empty when the direction offers none.</summary>
    public static string Lvto(RunwayCapability capability)
    {
        ArgumentNullException.ThrowIfNull(capability);
        return !capability.LvtoOffered ? "" : capability.LvtoAvailable ? "LVTO available" : "LVTO not available";
    }

    /// <summary>"TDZ", "MID", "END".</summary>
    public static string Position(RvrPosition position) => position.ToString().ToUpperInvariant();

    /// <summary>"serviceable", "degraded", "unserviceable".</summary>
    public static string Status(FacilityStatus status) => status switch
    {
        FacilityStatus.Serviceable => "serviceable",
        FacilityStatus.Degraded => "degraded",
        FacilityStatus.Unserviceable => "unserviceable",
        _ => status.ToString(),
    };

    /// <summary>One reason in words, e.g. "RVR TDZ 150 m below the 300 m this operation needs".</summary>
    public static string Reason(CapabilityReason reason)
    {
        ArgumentNullException.ThrowIfNull(reason);
        var position = reason.Position is { } p ? Position(p) : "";
        var detail = string.IsNullOrWhiteSpace(reason.Detail) ? "" : $" ({reason.Detail})";
        var observer = reason.Source == RvrSource.Observer ? " (observer)" : "";
        return reason.Kind switch
        {
            ReasonKind.FacilityUnserviceable => $"{reason.FacilityName} unserviceable{detail}",
            ReasonKind.FacilityDegraded => $"{reason.FacilityName} degraded{detail}",
            ReasonKind.FacilityUnknown => $"{reason.FacilityName} unknown to the profile",
            ReasonKind.LvpNotInForce => $"not {LvpVocabulary.Of(LvpState.InForce).Name}",
            ReasonKind.LvpSafeguardsIncomplete => $"not {LvpVocabulary.Of(LvpState.InForce).Name} — safeguards incomplete",
            ReasonKind.RvrBelowMinimum => $"RVR {position}{observer} {DisplayFormat.Metres(reason.ValueM ?? 0)} below the {DisplayFormat.Metres(reason.MinimumM ?? 0)} this operation needs",
            ReasonKind.RvrPositionSilent => $"RVR {position} sensor silent",
            ReasonKind.RvrPositionOutOfService => $"RVR {position} sensor out of service",
            ReasonKind.RvrPositionNoSensor => $"no RVR sensor at {position}",
            _ => reason.Kind.ToString(),
        };
    }

    /// <summary>The first reason an operation is not available, or empty when it is.</summary>
    public static string FirstReason(OperationCapability operation)
    {
        ArgumentNullException.ThrowIfNull(operation);
        return operation.Reasons.Count > 0 ? Reason(operation.Reasons[0]) : "";
    }

    /// <summary>
    /// The first reason the direction is not better: the first reason of the best operation offered that is not
    /// available (CAT III before CAT II before CAT I, then LVTO); empty when every operation is available.
    /// </summary>
    public static string FirstReason(RunwayCapability capability)
    {
        ArgumentNullException.ThrowIfNull(capability);
        var blocked = capability.Operations
            .Where(o => !o.Available)
            .OrderByDescending(o => o.Kind == OperationKind.Lvto ? 0 : CapabilityEvaluator.ApproachRank(o.Kind))
            .FirstOrDefault();
        return blocked is null ? "" : $"{Operation(blocked.Kind)}: {FirstReason(blocked)}";
    }

    /// <summary>One line for audit, exports and the timeline, e.g. "07L CAT II, LVTO available".</summary>
    public static string Summary(RunwayCapability capability)
    {
        ArgumentNullException.ThrowIfNull(capability);
        var lvto = Lvto(capability);
        return $"{capability.Direction} {BestApproach(capability.BestApproach)}{(lvto.Length > 0 ? ", " + lvto : "")}";
    }
}
