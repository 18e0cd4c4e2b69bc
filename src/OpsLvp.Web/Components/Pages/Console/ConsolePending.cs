namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>The pending transition: what, how long it has waited, and the confirm button's words.</summary>
public sealed record ConsolePending(string Text, string Age, string ConfirmLabel);
