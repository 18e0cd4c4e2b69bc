namespace OpsLvp.Core.Profile;

/// <summary>Checklist items per phase.</summary>
public sealed record ChecklistSet
{
    public IReadOnlyList<ChecklistItemConfig> Preparation { get; init; } = [];
    public IReadOnlyList<ChecklistItemConfig> Active { get; init; } = [];
    public IReadOnlyList<ChecklistItemConfig> Cancellation { get; init; } = [];
}
