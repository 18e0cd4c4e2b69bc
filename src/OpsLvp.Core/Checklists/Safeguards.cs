using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Checklists;

/// <summary>
/// "Safeguards complete": every mandatory preparation item of the running episode is done or marked not applicable.
/// LVP are in force (phase active) only once safeguarding is complete (docs/engine.md R13; common practice: the
/// aerodrome is safeguarded before LVP are declared in force); until then the phase is held at preparation.
/// </summary>
public static class Safeguards
{
    /// <summary>
    /// True when an episode is running (<paramref name="episode"/> not null) and no mandatory preparation item of
    /// it is open or closed-not-done (done and not applicable count). Optional items never block. An empty preparation checklist is complete.
    /// Only the latest instance of each item counts (an item re-opened after a re-instatement replaces the old one).
    /// </summary>
    public static bool AreComplete(Episode? episode, IEnumerable<ChecklistItemState> items)
    {
        ArgumentNullException.ThrowIfNull(items);
        return episode is not null && Outstanding(items).Count == 0;
    }

    /// <summary>Ids of mandatory preparation items neither done nor marked not applicable, in checklist order (latest instance of each item).</summary>
    public static IReadOnlyList<string> Outstanding(IEnumerable<ChecklistItemState> items)
    {
        ArgumentNullException.ThrowIfNull(items);
        var latest = new Dictionary<string, ChecklistItemState>(StringComparer.Ordinal);
        var order = new List<string>();
        foreach (var item in items)
        {
            if (item is null || item.Phase != Phase.Preparation)
            {
                continue;
            }
            if (!latest.ContainsKey(item.ItemId))
            {
                order.Add(item.ItemId);
            }
            latest[item.ItemId] = item;
        }
        return order.Where(id => latest[id] is { Mandatory: true, Status: not (ItemStatus.Done or ItemStatus.NotApplicable) }).ToList();
    }
}
