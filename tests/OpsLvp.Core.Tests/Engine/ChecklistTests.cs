using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md R11: items open on phase entry, due times, ticks, unticks, closing at episode end.</summary>
public class ChecklistTests
{
    private static EngineDriver InPreparation()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Run(40);
        return d;
    }

    [Fact]
    public void PreparationItems_OpenOnEntry_DueAtEntryPlusDueWithin()
    {
        var d = InPreparation();
        var p1 = d.State.Items.Single(i => i.ItemId == "P1");
        Assert.Equal((ItemStatus.Open, EngineDriver.At(30), EngineDriver.At(30 + 600)), (p1.Status, p1.OpenedAt, p1.DueAt));
    }

    [Fact]
    public void Tick_RecordsUserTeamTimeAndNote()
    {
        var d = InPreparation();
        var ticked = Assert.Single(d.Run(50, new TickItem("kim (invented)", "airside", "P1", "works stopped at stand 4")).OfType<ItemTicked>());
        Assert.Equal(new ItemTick("kim (invented)", "airside", EngineDriver.At(50), "works stopped at stand 4"), ticked.Tick);
        Assert.Equal(ItemStatus.Done, d.State.Items.Single(i => i.ItemId == "P1").Status);
    }

    [Fact]
    public void SecondTickOfTheSameItem_IsRefusedNamingWhoDidIt()
    {
        var d = InPreparation();
        var events = d.Run(50, new TickItem("kim (invented)", "airside", "P1"), new TickItem("lee (invented)", "airside", "P1"));
        Assert.Single(events.OfType<ItemTicked>());
        var refused = Assert.Single(events.OfType<CommandRefused>());
        Assert.Equal("item P1 already done by kim (invented) at 2026-12-01T03:00:50Z", refused.Reason);
    }

    [Fact]
    public void Tick_ForAnotherTeamsItem_IsRefused()
    {
        var d = InPreparation();
        var refused = Assert.Single(d.Run(50, new TickItem("kim (invented)", "lighting", "P1")).OfType<CommandRefused>());
        Assert.Equal("item P1 belongs to team airside, not lighting", refused.Reason);
    }

    [Fact]
    public void Tick_OfUnknownOrNotYetOpenItem_IsRefused()
    {
        var d = InPreparation();
        var events = d.Run(50, new TickItem("kim (invented)", "airside", "NOPE"), new TickItem("kim (invented)", "airside", "C1"));
        Assert.Equal(["unknown item 'NOPE'", "item C1 is not open: its Cancelling LVP checklist has not been opened"], events.OfType<CommandRefused>().Select(r => r.Reason));
    }

    [Fact]
    public void Untick_ReopensTheItem_WithTheReasonRecorded()
    {
        var d = InPreparation();
        d.Run(50, new TickItem("kim (invented)", "airside", "P1"));
        var untick = Assert.Single(d.Run(60, new UntickItem("kim (invented)", "P1", "ticked by mistake")).OfType<ItemUnticked>());
        Assert.Equal("ticked by mistake", untick.Reason);
        Assert.Equal(ItemStatus.Open, d.State.Items.Single(i => i.ItemId == "P1").Status);
    }

    [Fact]
    public void OverdueItem_RaisesAnAlarmAtItsDueInstant_ClearedByTheTick()
    {
        var d = InPreparation();
        d.WeatherFromTo(60, 660, 800);
        var raised = Assert.Single(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == "item-overdue:P1");
        Assert.Equal(EngineDriver.At(630), raised.At);
        d.Run(670, new TickItem("kim (invented)", "airside", "P1"));
        Assert.Single(d.Events.OfType<AlarmCleared>(), c => c.Key == "item-overdue:P1");
    }

    [Fact]
    public void PreparationItems_StayOpenThroughActive()
    {
        var d = InPreparation();
        d.Weather(60, 500);
        d.Run(100);
        Assert.Equal(Phase.Active, d.State.Phase);
        Assert.Equal(["P1", "P2", "A1"], d.State.Items.Where(i => i.Status == ItemStatus.Open).Select(i => i.ItemId));
    }

    [Fact]
    public void EpisodeEnd_ClosesOpenItemsAsNotDone_AndDoneItemsStayDone()
    {
        var d = InPreparation();
        d.Run(50, new TickItem("kim (invented)", "airside", "P1"));
        d.Run(60, new CancelLvp("dm (invented)", "conditions improving (invented)"));
        Assert.Equal(ItemStatus.Done, d.State.Items.Single(i => i.ItemId == "P1").Status);
        Assert.Equal(ItemStatus.ClosedNotDone, d.State.Items.Single(i => i.ItemId == "P2").Status);
        Assert.Equal(["P2"], Assert.Single(d.Events.OfType<ItemsClosed>()).ItemIds);
    }

    [Fact]
    public void ActiveCondition_WithMandatoryPreparationItemsOpen_RaisesSafeguardsIncomplete()
    {
        var d = InPreparation();
        d.Weather(60, 500);
        Assert.Contains(d.State.Alarms, a => a.Kind == AlarmKind.SafeguardsIncomplete);
        d.Run(70, new TickItem("kim (invented)", "airside", "P1"), new TickItem("ash (invented)", "lighting", "P2"));
        Assert.DoesNotContain(d.State.Alarms, a => a.Kind == AlarmKind.SafeguardsIncomplete);
    }
}
