namespace OpsLvp.Core.Capability;

/// <summary>Everything a capability depends on at one instant (docs/capability.md).</summary>
/// <param name="Facilities">Reported status per facility id; a facility with no report is serviceable.</param>
/// <param name="Positions">The RVR per runway direction and position (sensor, observer, or a gap); a position not listed has no sensor.</param>
/// <param name="Lvp">Whether LVP are in force (docs/engine.md R13).</param>
/// <param name="DirectionsInUse">The runway directions in use.</param>
public sealed record CapabilityInputs(
    IReadOnlyDictionary<string, FacilityState> Facilities,
    IReadOnlyList<PositionValue> Positions,
    LvpStanding Lvp,
    IReadOnlySet<string> DirectionsInUse);
