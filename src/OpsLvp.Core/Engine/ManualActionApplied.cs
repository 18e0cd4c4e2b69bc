namespace OpsLvp.Core.Engine;

/// <summary>A manual action of docs/engine.md R9 was applied (a transition it causes follows as its own event).</summary>
/// <param name="Action">Stable code: declare, cancel, release_hold, forecast, sensor_out, sensor_in.</param>
/// <param name="Detail">Readable detail, e.g. "declared active (hold)".</param>
/// <param name="Reason">The reason the person gave.</param>
/// <param name="At">The instant (UTC).</param>
/// <param name="Actor">The person.</param>
public sealed record ManualActionApplied(DateTimeOffset At, string Actor, string Action, string Detail, string Reason) : EngineEvent(At);
