using OpsLvp.Core.Engine;
using OpsLvp.Web.Components.Pages.Actions;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Actions;

/// <summary>Which items a tablet lists and their order. Items are invented.</summary>
public class ActionListTests
{
    private static readonly HashSet<string> Airside = ["airside"];

    [Fact]
    public void Orders_OverdueLongestFirst_ThenOpenByDue_ThenDoneLatestFirst()
    {
        var items = new[]
        {
            TestSnapshots.Item("D1", "airside", ItemStatus.Done, tick: new ItemTick("kim (invented)", "airside", TestSnapshots.T0.AddMinutes(1), null)),
            TestSnapshots.Item("D2", "airside", ItemStatus.Done, tick: new ItemTick("kim (invented)", "airside", TestSnapshots.T0.AddMinutes(2), null)),
            TestSnapshots.Item("O1", "airside", dueMinutes: 20),
            TestSnapshots.Item("O2", "airside", dueMinutes: 15),
            TestSnapshots.Item("X1", "airside", dueMinutes: 3, overdue: true),
            TestSnapshots.Item("X2", "airside", dueMinutes: 1, overdue: true),
        };
        Assert.Equal(["X2", "X1", "O2", "O1", "D2", "D1"], ActionList.For(items, Airside).Select(i => i.ItemId));
    }

    [Fact]
    public void LeavesOut_OtherTeams_VoidedAndClosedItems()
    {
        var items = new[]
        {
            TestSnapshots.Item("P1", "lighting"),
            TestSnapshots.Item("C1", "airside", ItemStatus.Voided, phase: Phase.Cancellation),
            TestSnapshots.Item("P2", "airside", ItemStatus.ClosedNotDone),
            TestSnapshots.Item("P3", "airside"),
        };
        Assert.Equal(["P3"], ActionList.For(items, Airside).Select(i => i.ItemId));
    }

    [Fact]
    public void ReopenedItem_ShowsOnlyItsLatestInstance()
    {
        var items = new[]
        {
            TestSnapshots.Item("A1", "airside", ItemStatus.Done, phase: Phase.Active, tick: new ItemTick("kim (invented)", "airside", TestSnapshots.T0, null)),
            TestSnapshots.Item("A1", "airside", phase: Phase.Active, openedAt: TestSnapshots.T0.AddMinutes(30)),
        };
        var only = Assert.Single(ActionList.For(items, Airside));
        Assert.Equal((ItemStatus.Open, TestSnapshots.T0.AddMinutes(30)), (only.Status, only.OpenedAt));
    }
}
