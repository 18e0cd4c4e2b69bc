using OpsLvp.Core.Engine;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>A team's checklist progress in the running episode.</summary>
/// <param name="Done">Items done (latest instance of each item).</param>
/// <param name="Total">Items open, done or closed not done; voided items do not count.</param>
/// <param name="Overdue">Open items past their due time.</param>
public sealed record TeamProgress(string Team, string TeamName, int Done, int Total, int Overdue)
{
    /// <summary>Per team, in team-name order, counting only the items of <paramref name="phase"/> (the current phase).</summary>
    public static IReadOnlyList<TeamProgress> For(IEnumerable<ChecklistItemView>? items, Phase phase) =>
        For((items ?? []).Where(i => i is not null && i.Phase == phase));

    /// <summary>Per team, in team-name order.</summary>
    public static IReadOnlyList<TeamProgress> For(IEnumerable<ChecklistItemView>? items)
    {
        var latest = new Dictionary<string, ChecklistItemView>(StringComparer.Ordinal);
        foreach (var item in items ?? [])
        {
            if (item is not null && (!latest.TryGetValue(item.ItemId, out var seen) || item.OpenedAt >= seen.OpenedAt))
            {
                latest[item.ItemId] = item;
            }
        }
        return latest.Values
            .Where(i => i.Status != ItemStatus.Voided)
            .GroupBy(i => i.Team, StringComparer.Ordinal)
            .Select(g => new TeamProgress(
                g.Key,
                g.First().TeamName,
                g.Count(i => i.Status is ItemStatus.Done or ItemStatus.NotApplicable),
                g.Count(),
                g.Count(i => i.Status == ItemStatus.Open && i.Overdue)))
            .OrderBy(p => p.TeamName, StringComparer.Ordinal)
            .ToList();
    }
}
