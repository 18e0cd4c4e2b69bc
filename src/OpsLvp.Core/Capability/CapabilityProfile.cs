namespace OpsLvp.Core.Capability;

/// <summary>The profile section <c>capability</c> (docs/capability.md): facilities, operations per runway direction, observer RVR age.</summary>
public sealed record CapabilityProfile
{
    public IReadOnlyList<FacilityConfig> Facilities { get; init; } = [];

    public IReadOnlyList<OperationConfig> Operations { get; init; } = [];

    /// <summary>How long an observer's RVR counts for its position, seconds (&gt; 0; default 600).</summary>
    public int ObserverRvrMaxAgeSeconds { get; init; } = 600;
}
