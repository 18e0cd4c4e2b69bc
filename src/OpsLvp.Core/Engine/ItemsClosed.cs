namespace OpsLvp.Core.Engine;

/// <summary>Open items were closed: not done at the end of an episode, or voided by re-instatement (docs/engine.md R8, R11).</summary>
/// <param name="Status"><see cref="ItemStatus.ClosedNotDone"/> or <see cref="ItemStatus.Voided"/>.</param>
/// <param name="At">The instant (UTC).</param>
/// <param name="ItemIds">The items concerned.</param>
public sealed record ItemsClosed(DateTimeOffset At, ItemStatus Status, IReadOnlyList<string> ItemIds) : EngineEvent(At);
