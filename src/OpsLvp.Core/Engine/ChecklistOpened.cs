namespace OpsLvp.Core.Engine;

/// <summary>The checklist of <paramref name="Phase"/> opened with these item ids (docs/engine.md R11).</summary>
public sealed record ChecklistOpened(DateTimeOffset At, Phase Phase, IReadOnlyList<string> ItemIds) : EngineEvent(At);
