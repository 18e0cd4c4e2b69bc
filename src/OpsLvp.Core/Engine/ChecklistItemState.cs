namespace OpsLvp.Core.Engine;

/// <summary>One checklist item of the running episode (docs/engine.md R11).</summary>
/// <param name="ItemId">The profile's item id.</param>
/// <param name="Phase">The checklist it belongs to.</param>
/// <param name="Team">Owning team id.</param>
/// <param name="Mandatory">From the profile.</param>
/// <param name="OpenedAt">When its phase was entered.</param>
/// <param name="DueAt">OpenedAt + due-within.</param>
/// <param name="Status">Open, done, closed not done, or voided.</param>
/// <param name="Tick">Who ticked it and when, while done.</param>
public sealed record ChecklistItemState(
    string ItemId,
    Phase Phase,
    string Team,
    bool Mandatory,
    DateTimeOffset OpenedAt,
    DateTimeOffset DueAt,
    ItemStatus Status,
    ItemTick? Tick = null)
{
    /// <summary>True when open and past its due time at <paramref name="now"/>.</summary>
    public bool IsOverdue(DateTimeOffset now) => Status == ItemStatus.Open && now >= DueAt;
}
