using OpsLvp.Core.Capability;

namespace OpsLvp.Core.Engine;

/// <summary>The headline of a runway direction in use before a downgrade (docs/engine.md R37): the alarm stands until it is back at least here.</summary>
public sealed record CapabilityBaseline(string Direction, OperationKind? BestApproach, bool LvtoAvailable, string Summary);
