namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>An open mandatory safeguard the duty manager may mark not applicable, named by its text.</summary>
public sealed record ConsoleSafeguard(string ItemId, string Text, string ButtonLabel);
