namespace OpsLvp.Core.Capability;

/// <summary>
/// An operation the aerodrome offers on a runway direction (profile <c>capability.operations[]</c>, docs/capability.md).
/// Every requirement is a local value from the aerodrome's approved instruction.
/// </summary>
/// <param name="Direction">The runway direction, e.g. "07L".</param>
/// <param name="Kind">CAT I, CAT II, CAT III or LVTO.</param>
/// <param name="Facilities">Facility ids that must be serviceable.</param>
/// <param name="Rvr">Positions needed and the minimum RVR at each.</param>
/// <param name="NeedsLvp">Whether LVP must be in force (true for CAT II, CAT III and LVTO in the demo).</param>
/// <param name="AcceptDegraded">Facility ids of <paramref name="Facilities"/> that may be degraded (still not unserviceable).</param>
public sealed record OperationConfig(
    string Direction,
    OperationKind Kind,
    IReadOnlyList<string> Facilities,
    IReadOnlyList<RvrMinimum> Rvr,
    bool NeedsLvp,
    IReadOnlyList<string>? AcceptDegraded = null);
