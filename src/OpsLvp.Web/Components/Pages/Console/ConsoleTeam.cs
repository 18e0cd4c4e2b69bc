namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>
/// A team's progress on the current phase's items: the count in words beside the bar ("2 of 3 done · 1 overdue"),
/// the bar's accessible name and its fill in percent.
/// </summary>
public sealed record ConsoleTeam(string Team, string TeamName, string CountText, string AriaLabel, double Percent, bool Overdue, string CssClass);
