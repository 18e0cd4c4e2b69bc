using OpsLvp.Core.Checklists;
using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Tests.Checklists;

/// <summary>"Safeguards complete": all mandatory preparation items done (docs/sources.md LVP phases, EUR Doc 013, from memory). Items are invented.</summary>
public class SafeguardsTests
{
    private static readonly DateTimeOffset T = new(2026, 12, 1, 3, 0, 0, TimeSpan.Zero);
    private static readonly Episode Running = new("XDMO-20261201T030000Z", T, Phase.Preparation);

    private static ChecklistItemState Item(string id, Phase phase, bool mandatory, ItemStatus status) =>
        new(id, phase, "airside", mandatory, T, T.AddMinutes(10), status, status == ItemStatus.Done ? new ItemTick("kim (invented)", "airside", T, null) : null);

    [Fact]
    public void AllMandatoryPreparationItemsDone_IsComplete_WhileOptionalAndOtherPhasesDoNotCount()
    {
        ChecklistItemState[] items =
        [
            Item("P1", Phase.Preparation, true, ItemStatus.Done),
            Item("P3", Phase.Preparation, false, ItemStatus.Open),
            Item("A1", Phase.Active, true, ItemStatus.Open),
        ];
        Assert.True(Safeguards.AreComplete(Running, items));
        Assert.Empty(Safeguards.Outstanding(items));
    }

    [Fact]
    public void OpenOrClosedMandatoryPreparationItems_AreOutstanding_InChecklistOrder()
    {
        ChecklistItemState[] items =
        [
            Item("P2", Phase.Preparation, true, ItemStatus.Open),
            Item("P1", Phase.Preparation, true, ItemStatus.Done),
            Item("P4", Phase.Preparation, true, ItemStatus.ClosedNotDone),
        ];
        Assert.False(Safeguards.AreComplete(Running, items));
        Assert.Equal(["P2", "P4"], Safeguards.Outstanding(items));
    }

    [Fact]
    public void OnlyTheLatestInstanceOfAnItemCounts()
    {
        ChecklistItemState[] items = [Item("P1", Phase.Preparation, true, ItemStatus.ClosedNotDone), Item("P1", Phase.Preparation, true, ItemStatus.Done)];
        Assert.True(Safeguards.AreComplete(Running, items));
    }

    [Fact]
    public void WithoutARunningEpisode_SafeguardsAreNotComplete()
    {
        Assert.False(Safeguards.AreComplete(null, []));
    }

    [Fact]
    public void EmptyPreparationChecklist_IsComplete()
    {
        Assert.True(Safeguards.AreComplete(Running, []));
    }
}
