using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Engine;

/// <summary>
/// An observed RVR for one position of a runway direction (docs/engine.md R35; common practice: counting runway edge
/// lights), entered by <paramref name="Actor"/> for the named <paramref name="Observer"/>. Accepted only while that
/// position's sensor is silent or out of service.
/// </summary>
public sealed record EnterObserverRvr(string Actor, string Direction, RvrPosition Position, double ValueM, string Observer, string? Reason = null) : EngineCommand(Actor);
