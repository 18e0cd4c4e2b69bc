namespace OpsLvp.Core.Capability;

/// <summary>A facility low-visibility operations depend on (profile <c>capability.facilities[]</c>, docs/capability.md).</summary>
/// <param name="Id">Unique id, e.g. "ils-07l".</param>
/// <param name="Name">What people call it, e.g. "ILS 07L".</param>
/// <param name="Kind">What it is.</param>
/// <param name="Directions">The runway directions it serves (at least one).</param>
/// <param name="Team">The team that reports on it (a profile team id); it may report faults from its tablets.</param>
/// <param name="IlsCategory">For an ILS, the approach category it is classified for; else null.</param>
/// <param name="SwitchOverSeconds">For standby power, the switch-over time in seconds; else null.</param>
/// <param name="Sensor">For an RVR sensor, the profile sensor id; else null.</param>
public sealed record FacilityConfig(
    string Id,
    string Name,
    FacilityKind Kind,
    IReadOnlyList<string> Directions,
    string Team,
    OperationKind? IlsCategory = null,
    double? SwitchOverSeconds = null,
    string? Sensor = null);
