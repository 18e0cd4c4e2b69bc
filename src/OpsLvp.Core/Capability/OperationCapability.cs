namespace OpsLvp.Core.Capability;

/// <summary>One operation of a runway direction: available, or not with every reason (in a fixed order: facilities, LVP, RVR).</summary>
public sealed record OperationCapability(OperationKind Kind, bool Available, IReadOnlyList<CapabilityReason> Reasons)
{
    /// <summary>Whether an observer's RVR counts toward this operation's availability.</summary>
    public bool UsesObserverRvr { get; init; }
}
