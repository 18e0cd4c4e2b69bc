namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>
/// A raised alarm: its kind's label (the headline), message, since when, acknowledged or not, and whether the message
/// is longer than the wall shows (<see cref="WallViewModel.AlarmMessageLines"/> lines; the console has it in full).
/// </summary>
public sealed record WallAlarm(string Key, string Label, string Message, string Since, bool Acknowledged, string CssClass, bool Shortened);
