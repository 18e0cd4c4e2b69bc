namespace OpsLvp.Core.Engine;

/// <summary>
/// A manual relaxation (cancel, docs/engine.md R9) made while the conditions did not support it (docs/engine.md R15):
/// kept in the state, and shown beside the phase, until the recovery condition of <paramref name="From"/> holds or
/// the phase is back at <paramref name="From"/> or above.
/// </summary>
public sealed record Relaxation(string Actor, Phase From, Phase To, DateTimeOffset At, string Reason);
