namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>A standing notice on the wall: pending confirmation, hold or forecast flag.</summary>
/// <param name="Label">Short upper-case label ("AWAITING CONFIRMATION").</param>
/// <param name="Text">The detail.</param>
/// <param name="CssClass">Look of the notice.</param>
public sealed record WallNotice(string Label, string Text, string CssClass);
