using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Capability;

/// <summary>One reason an operation is not available, as data; <c>Presentation.CapabilityWords</c> words it.</summary>
/// <param name="Kind">What is wrong.</param>
/// <param name="Facility">The facility id for facility reasons.</param>
/// <param name="FacilityName">Its name, for wording.</param>
/// <param name="Detail">The reporter's reason for a degraded or unserviceable facility.</param>
/// <param name="Position">The RVR position for RVR reasons.</param>
/// <param name="ValueM">The RVR there, metres, for <see cref="ReasonKind.RvrBelowMinimum"/>.</param>
/// <param name="MinimumM">The minimum the operation needs there, metres.</param>
/// <param name="Source">Whether the RVR value came from a sensor or an observer.</param>
public sealed record CapabilityReason(
    ReasonKind Kind,
    string? Facility = null,
    string? FacilityName = null,
    string? Detail = null,
    RvrPosition? Position = null,
    double? ValueM = null,
    double? MinimumM = null,
    RvrSource? Source = null);
