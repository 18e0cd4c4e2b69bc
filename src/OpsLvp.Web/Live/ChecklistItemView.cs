using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Live;

/// <summary>A checklist item as screens show it: the engine's item state plus the profile's text and team name.</summary>
/// <param name="Overdue">Open and past its due time at the snapshot instant.</param>
public sealed record ChecklistItemView(
    string ItemId,
    string Text,
    Phase Phase,
    string Team,
    string TeamName,
    bool Mandatory,
    DateTimeOffset OpenedAt,
    DateTimeOffset DueAt,
    ItemStatus Status,
    ItemTick? Tick,
    bool Overdue);
