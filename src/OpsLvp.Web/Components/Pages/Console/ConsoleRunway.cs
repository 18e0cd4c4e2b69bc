namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>An LVP runway's positions on the console: "RWY 07".</summary>
public sealed record ConsoleRunway(string Title, IReadOnlyList<ConsolePosition> Positions);
