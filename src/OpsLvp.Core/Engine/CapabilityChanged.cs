using OpsLvp.Core.Capability;

namespace OpsLvp.Core.Engine;

/// <summary>
/// The capability of one or more runway directions changed (docs/engine.md R36): the whole list before and after; an
/// empty <paramref name="Before"/> is the first evaluation.
/// </summary>
public sealed record CapabilityChanged(DateTimeOffset At, IReadOnlyList<RunwayCapability> Before, IReadOnlyList<RunwayCapability> After) : EngineEvent(At);
