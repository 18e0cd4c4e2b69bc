namespace OpsLvp.Core.Engine;

/// <summary>A manual declaration that keeps the phase at or above <paramref name="Phase"/> (docs/engine.md R9).</summary>
public sealed record Hold(Phase Phase, string Actor, string Reason, DateTimeOffset Since);
