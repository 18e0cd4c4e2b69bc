namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>Something the engine waits for; dwells carry a progress percentage (0–100).</summary>
public sealed record WallWait(string Text, int? Percent, string CssClass);
