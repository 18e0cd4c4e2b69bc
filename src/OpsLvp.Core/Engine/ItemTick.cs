namespace OpsLvp.Core.Engine;

/// <summary>A tick: user, team, time and an optional note (docs/engine.md R11).</summary>
public sealed record ItemTick(string User, string Team, DateTimeOffset At, string? Note);
