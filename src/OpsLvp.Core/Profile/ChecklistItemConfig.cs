namespace OpsLvp.Core.Profile;

/// <summary>One protective action (DESIGN R11).</summary>
/// <param name="Id">Unique across all checklists of the profile.</param>
/// <param name="Text">What to do, as the team reads it.</param>
/// <param name="Team">Owning team id.</param>
/// <param name="Mandatory">Whether it must be done (cancellation ends only when every mandatory item is done).</param>
/// <param name="DueWithinMinutes">Due at phase entry + this many minutes.</param>
public sealed record ChecklistItemConfig(string Id, string Text, string Team, bool Mandatory = true, int DueWithinMinutes = 15);
