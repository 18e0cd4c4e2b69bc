namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>A team's open items, overdue first; <paramref name="Hidden"/> items did not fit on the wall.</summary>
public sealed record WallTeam(string Name, string Summary, bool AnyOverdue, IReadOnlyList<WallItem> Items, int Hidden);
