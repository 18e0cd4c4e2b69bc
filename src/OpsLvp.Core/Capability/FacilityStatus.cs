namespace OpsLvp.Core.Capability;

/// <summary>A facility's status as reported (docs/capability.md).</summary>
public enum FacilityStatus
{
    Serviceable,
    /// <summary>Working with a limitation (a reason is required); counts as not meeting a requirement unless the operation accepts it degraded.</summary>
    Degraded,
    Unserviceable,
}
