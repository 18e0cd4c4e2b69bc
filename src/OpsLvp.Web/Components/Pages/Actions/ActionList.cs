using OpsLvp.Core.Engine;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Pages.Actions;

/// <summary>Which checklist items a tablet shows and in what order.</summary>
public static class ActionList
{
    /// <summary>
    /// The latest instance of each item of <paramref name="teams"/> that is open or done (voided and closed items
    /// are history, not work). Overdue first (longest overdue first), then open by due time, then done, latest tick first.
    /// </summary>
    public static IReadOnlyList<ChecklistItemView> For(IEnumerable<ChecklistItemView>? items, IReadOnlySet<string> teams)
    {
        ArgumentNullException.ThrowIfNull(teams);
        var latest = new Dictionary<string, ChecklistItemView>(StringComparer.Ordinal);
        foreach (var item in items ?? [])
        {
            if (item is null || !teams.Contains(item.Team))
            {
                continue;
            }
            if (!latest.TryGetValue(item.ItemId, out var seen) || item.OpenedAt >= seen.OpenedAt)
            {
                latest[item.ItemId] = item;
            }
        }
        return latest.Values
            .Where(i => i.Status is ItemStatus.Open or ItemStatus.Done or ItemStatus.NotApplicable)
            .OrderBy(Rank)
            .ThenBy(i => i.Status is ItemStatus.Done or ItemStatus.NotApplicable ? -(i.Tick?.At.UtcTicks ?? 0) : i.DueAt.UtcTicks)
            .ThenBy(i => i.ItemId, StringComparer.Ordinal)
            .ToList();
    }

    private static int Rank(ChecklistItemView item) => item switch
    {
        { Status: ItemStatus.Open, Overdue: true } => 0,
        { Status: ItemStatus.Open } => 1,
        _ => 2,
    };
}
