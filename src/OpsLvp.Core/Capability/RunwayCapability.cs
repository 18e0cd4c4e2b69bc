namespace OpsLvp.Core.Capability;

/// <summary>What one runway direction supports now (docs/capability.md).</summary>
/// <param name="Direction">Runway direction, e.g. "07L".</param>
/// <param name="InUse">Whether it is the direction in use of its runway.</param>
/// <param name="BestApproach">The best available approach category; null when none is.</param>
/// <param name="LvtoOffered">Whether the profile offers LVTO on this direction.</param>
/// <param name="LvtoAvailable">Whether LVTO is available.</param>
/// <param name="Operations">Every operation offered, in profile order.</param>
public sealed record RunwayCapability(
    string Direction,
    bool InUse,
    OperationKind? BestApproach,
    bool LvtoOffered,
    bool LvtoAvailable,
    IReadOnlyList<OperationCapability> Operations);
