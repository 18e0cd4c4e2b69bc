using Bunit;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Actions;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Components.Testing;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Tests.Components.Actions;

/// <summary>The tablet page keeps a ticked card in place until a scroll or the hold time, and folds done items of earlier phases (issue 13). Items and people invented.</summary>
public sealed class TabletHoldTests : LiveComponentTest
{
    private const string Kim = "kim (invented)";

    private readonly FakeTimeProvider _real = new(new DateTimeOffset(2026, 12, 1, 3, 0, 0, TimeSpan.Zero));

    public TabletHoldTests()
    {
        Services.AddKeyedSingleton<TimeProvider>(TimeServiceCollectionExtensions.NetworkClockKey, _real);
    }

    private static ItemTick TickBy(int minute) => new(Kim, "airside", TestSnapshots.T0.AddMinutes(minute), null);

    private static string[] CardIds(IRenderedComponent<TabletActions> cut) =>
        [.. cut.FindAll("[data-testid=actions-grid] > [data-testid=action-item]").Select(c => c.GetAttribute("data-item-id") ?? "")];

    private static string[] FoldedIds(IRenderedComponent<TabletActions> cut) =>
        [.. cut.FindAll("[data-testid=actions-done-earlier] [data-testid=action-item]").Select(c => c.GetAttribute("data-item-id") ?? "")];

    private static readonly ChecklistItemView[] Before =
    [
        TestSnapshots.Item("P0", "airside", ItemStatus.Done, tick: TickBy(1)),
        TestSnapshots.Item("P1", "airside", dueMinutes: 5),
        TestSnapshots.Item("A1", "airside", dueMinutes: 20, phase: Phase.Active),
    ];

    private async Task<IRenderedComponent<TabletActions>> TickP1Async()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, phase: Phase.Active, items: Before));
        var cut = Render<TabletActions>();
        Assert.Equal(["P1", "A1"], CardIds(cut));

        cut.Find("[data-item-id=P1] [data-testid=action-tick]").Click();
        cut.Find("[data-testid=action-confirm-yes]").Click();
        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, phase: Phase.Active, items:
            [Before[0], Before[1] with { Status = ItemStatus.Done, Tick = TickBy(4) }, Before[2]])));
        return cut;
    }

    [Fact]
    public void DoneItemsOfEarlierPhases_AreInACollapsedDoneSection()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, phase: Phase.Active, items: Before));
        var cut = Render<TabletActions>();

        Assert.Equal(["P1", "A1"], CardIds(cut));
        var section = cut.Find("[data-testid=actions-done-earlier]");
        Assert.False(section.HasAttribute("open"));
        Assert.Equal("Done in earlier phases (1)", cut.Find("[data-testid=actions-done-earlier-summary]").TextContent.Trim());
        Assert.Equal(["P0"], FoldedIds(cut));
    }

    [Fact]
    public async Task TickedCard_StaysInPlaceShowingDone_UntilTheHoldTimeIsUp_ThenFoldsAway()
    {
        var cut = await TickP1Async();

        cut.WaitForAssertion(() => Assert.Equal("done", cut.Find("[data-item-id=P1]").GetAttribute("data-status")));
        Assert.Equal(["P1", "A1"], CardIds(cut));
        Assert.Equal(["P0"], FoldedIds(cut));

        _real.Advance(TabletCards.DefaultHold - TimeSpan.FromMilliseconds(10));
        Assert.Equal(["P1", "A1"], CardIds(cut));

        _real.Advance(TimeSpan.FromMilliseconds(10));
        cut.WaitForAssertion(() => Assert.Equal(["A1"], CardIds(cut)));
        Assert.Equal(["P1", "P0"], FoldedIds(cut));
    }

    [Fact]
    public async Task AScroll_LetsTheCardsSortAgain_BeforeTheHoldTime()
    {
        var cut = await TickP1Async();
        cut.WaitForAssertion(() => Assert.Equal("done", cut.Find("[data-item-id=P1]").GetAttribute("data-status")));
        Assert.Equal(["P1", "A1"], CardIds(cut));

        await cut.Instance.Scrolled();

        cut.WaitForAssertion(() => Assert.Equal(["A1"], CardIds(cut)));
        Assert.Equal(["P1", "P0"], FoldedIds(cut));
    }
}
