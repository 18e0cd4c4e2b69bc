namespace OpsLvp.Core.Engine;

/// <summary>A tick: user, team, time and an optional note (DESIGN R11).</summary>
public sealed record ItemTick(string User, string Team, DateTimeOffset At, string? Note);
