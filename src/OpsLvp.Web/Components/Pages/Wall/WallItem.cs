namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>An open checklist item: its text, when it is due or how late it is.</summary>
public sealed record WallItem(string ItemId, string Text, string DueText, bool Overdue, bool Mandatory);
