namespace OpsLvp.Core.Capability;

/// <summary>Why an operation is not available (docs/capability.md).</summary>
public enum ReasonKind
{
    FacilityUnserviceable,
    FacilityDegraded,
    /// <summary>The operation names a facility the profile does not know or that has no status (counts as unserviceable).</summary>
    FacilityUnknown,
    LvpNotInForce,
    LvpSafeguardsIncomplete,
    RvrBelowMinimum,
    RvrPositionSilent,
    RvrPositionOutOfService,
    RvrPositionNoSensor,
}
