using OpsLvp.Core.Engine;
using OpsLvp.Web.Components.Pages.Actions;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Actions;

/// <summary>The tablet's card order: held under a finger, sorted and folded otherwise (issue 13). Items invented.</summary>
public sealed class TabletCardsTests
{
    private static readonly DateTimeOffset Real = new(2026, 12, 1, 3, 0, 0, TimeSpan.Zero);

    private static readonly HashSet<string> Airside = ["airside"];

    private static ItemTick Tick(int minute) => new("kim (invented)", "airside", TestSnapshots.T0.AddMinutes(minute), null);

    private static IReadOnlyList<ChecklistItemView> Sorted(params ChecklistItemView[] items) => ActionList.For(items, Airside);

    private static string[] Ids(IEnumerable<ChecklistItemView> items) => [.. items.Select(i => i.ItemId)];

    [Fact]
    public void NotHeld_CardsAreSorted_AndDoneItemsOfEarlierPhasesFoldAway()
    {
        var cards = new TabletCards();
        cards.Show(Sorted(
            TestSnapshots.Item("P1", "airside", ItemStatus.Done, tick: Tick(2)),
            TestSnapshots.Item("P2", "airside", dueMinutes: 5),
            TestSnapshots.Item("A1", "airside", dueMinutes: 20, phase: Phase.Active),
            TestSnapshots.Item("A2", "airside", ItemStatus.Done, tick: Tick(3), phase: Phase.Active)), Phase.Active, Real);

        // an open item of an earlier phase stays (it is still work); a done item of the current phase stays (at the end)
        Assert.Equal(["P2", "A1", "A2"], Ids(cards.Cards));
        Assert.Equal(["P1"], Ids(cards.Folded));
        Assert.Null(cards.HeldUntil);
    }

    [Fact]
    public void InPreparation_NothingFolds_ThereIsNoEarlierPhase()
    {
        var cards = new TabletCards();
        cards.Show(Sorted(TestSnapshots.Item("P1", "airside", ItemStatus.Done, tick: Tick(2)), TestSnapshots.Item("P2", "airside")), Phase.Preparation, Real);
        Assert.Equal(["P2", "P1"], Ids(cards.Cards));
        Assert.Empty(cards.Folded);
    }

    [Fact]
    public void TickedCard_StaysInPlace_WhileHeld_ThenSortsAndFolds_WhenTheHoldTimeIsUp()
    {
        var cards = new TabletCards();
        var p1 = TestSnapshots.Item("P1", "airside", dueMinutes: 5);
        var p2 = TestSnapshots.Item("P2", "airside", dueMinutes: 8);
        var a1 = TestSnapshots.Item("A1", "airside", dueMinutes: 20, phase: Phase.Active);
        cards.Show(Sorted(p1, p2, a1), Phase.Active, Real);
        Assert.Equal(["P1", "P2", "A1"], Ids(cards.Cards));

        cards.Hold(Real.AddSeconds(1));
        var done = p1 with { Status = ItemStatus.Done, Tick = Tick(4) };
        cards.Show(Sorted(done, p2, a1), Phase.Active, Real.AddSeconds(2));

        // same place, fresher state: the card shows done where the finger left it
        Assert.Equal(["P1", "P2", "A1"], Ids(cards.Cards));
        Assert.Equal(ItemStatus.Done, cards.Cards[0].Status);
        Assert.Empty(cards.Folded);
        Assert.Equal(Real.AddSeconds(1) + TabletCards.DefaultHold, cards.HeldUntil);
        Assert.False(cards.Release(Real.AddSeconds(1) + TabletCards.DefaultHold - TimeSpan.FromMilliseconds(1)));
        Assert.Equal(["P1", "P2", "A1"], Ids(cards.Cards));

        Assert.True(cards.Release(Real.AddSeconds(1) + TabletCards.DefaultHold));
        Assert.Equal(["P2", "A1"], Ids(cards.Cards));
        Assert.Equal(["P1"], Ids(cards.Folded));
        Assert.Null(cards.HeldUntil);
    }

    [Fact]
    public void AScroll_EndsTheHoldAtOnce()
    {
        var cards = new TabletCards();
        var p1 = TestSnapshots.Item("P1", "airside", dueMinutes: 5);
        var p2 = TestSnapshots.Item("P2", "airside", dueMinutes: 8);
        cards.Show(Sorted(p1, p2), Phase.Preparation, Real);
        cards.Hold(Real);
        cards.Show(Sorted(p1 with { Status = ItemStatus.Done, Tick = Tick(4) }, p2), Phase.Preparation, Real.AddSeconds(1));
        Assert.Equal(["P1", "P2"], Ids(cards.Cards));

        Assert.True(cards.Release());
        Assert.Equal(["P2", "P1"], Ids(cards.Cards));
        Assert.False(cards.Release());
    }

    [Fact]
    public void WhileHeld_NewCardsGoToTheEnd_GoneCardsLeave_AndASnapshotAfterTheHoldSortsAgain()
    {
        var cards = new TabletCards();
        var p1 = TestSnapshots.Item("P1", "airside", dueMinutes: 5);
        var p2 = TestSnapshots.Item("P2", "airside", dueMinutes: 8);
        cards.Show(Sorted(p1, p2), Phase.Preparation, Real);
        cards.Hold(Real);
        // the phase moves on: a new, overdue item would sort first, and P2 is voided (gone)
        var a1 = TestSnapshots.Item("A1", "airside", dueMinutes: 1, overdue: true, phase: Phase.Active);
        cards.Show(Sorted(p1 with { Status = ItemStatus.Done, Tick = Tick(4) }, a1), Phase.Active, Real.AddSeconds(1));
        Assert.Equal(["P1", "A1"], Ids(cards.Cards));
        Assert.Empty(cards.Folded);

        cards.Show(Sorted(p1 with { Status = ItemStatus.Done, Tick = Tick(4) }, a1), Phase.Active, Real + TabletCards.DefaultHold);
        Assert.Equal(["A1"], Ids(cards.Cards));
        Assert.Equal(["P1"], Ids(cards.Folded));
    }

    [Fact]
    public void AnotherTouch_ExtendsTheHold_FromTheLastTouch()
    {
        var cards = new TabletCards();
        cards.Show(Sorted(TestSnapshots.Item("P1", "airside")), Phase.Preparation, Real);
        cards.Hold(Real);
        cards.Hold(Real.AddSeconds(3));
        Assert.Equal(Real.AddSeconds(3) + TabletCards.DefaultHold, cards.HeldUntil);
        Assert.False(cards.Release(Real + TabletCards.DefaultHold));
    }
}
