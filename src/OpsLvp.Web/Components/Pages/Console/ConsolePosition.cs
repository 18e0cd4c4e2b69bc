namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>One RVR position on the console: "TDZ", "550 m", CSS class ("" or "oos").</summary>
public sealed record ConsolePosition(string Label, string Value, string CssClass);
