namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>A raised alarm: message, since when, acknowledged or not.</summary>
public sealed record WallAlarm(string Key, string Message, string Since, bool Acknowledged, string CssClass);
