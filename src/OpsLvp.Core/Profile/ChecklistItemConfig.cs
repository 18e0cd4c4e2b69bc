using System.Text.Json.Serialization;

namespace OpsLvp.Core.Profile;

/// <summary>One protective action (docs/engine.md R11).</summary>
/// <param name="Id">Unique across all checklists of the profile.</param>
/// <param name="Text">What to do, as the team reads it.</param>
/// <param name="Team">Owning team id.</param>
/// <param name="Mandatory">Whether it must be done (cancellation ends only when every mandatory item is done).</param>
/// <param name="DueWithinMinutes">Due at phase entry + this many minutes.</param>
/// <param name="After">Ids of items of the same checklist that must be done (or marked not applicable) before this one
/// can be ticked (docs/engine.md R16); null or empty for none.</param>
public sealed record ChecklistItemConfig(string Id, string Text, string Team, bool Mandatory = true, int DueWithinMinutes = 15,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.WhenWritingNull)] IReadOnlyList<string>? After = null);
