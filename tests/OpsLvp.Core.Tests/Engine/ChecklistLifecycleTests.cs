using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R8, R11 beyond <see cref="ChecklistTests"/>: items across direct escalation and re-instatement, the
/// safeguards status and alarm, undo rules and ticks from two tablets in turn. Names and times are invented.
/// </summary>
public class ChecklistLifecycleTests
{
    private const string Kim = "kim (invented)";
    private const string Lee = "lee (invented)";

    private static EngineStatus Status(EngineDriver d, double seconds) => d.Engine.Describe(d.State, EngineDriver.At(seconds));

    [Fact]
    public void DirectEscalationToActive_OpensPreparationAndActiveItemsAtOnce_WithTheirOwnDueTimes()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Run(40);
        Assert.Equal("30:Normal->Active", d.TransitionLog);
        var due = d.State.Items.Select(i => (i.ItemId, i.Status, i.OpenedAt, i.DueAt)).ToList();
        Assert.Equal(
            [
                ("P1", ItemStatus.Open, EngineDriver.At(30), EngineDriver.At(30 + 600)), // profile: due within 10 min (invented)
                ("P2", ItemStatus.Open, EngineDriver.At(30), EngineDriver.At(30 + 900)), // 15 min (invented)
                ("A1", ItemStatus.Open, EngineDriver.At(30), EngineDriver.At(30 + 300)), // 5 min (invented)
            ],
            due);
    }

    [Fact]
    public void DirectEscalation_RaisesSafeguardsIncompleteAtTheTransition_AndStatusSaysNotComplete()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Run(40);
        var raised = Assert.Single(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Kind == AlarmKind.SafeguardsIncomplete);
        Assert.Equal(EngineDriver.At(30), raised.At);
        var status = Status(d, 40);
        Assert.False(status.SafeguardsComplete);
        Assert.Equal(["P1", "P2"], status.SafeguardsOutstanding);
    }

    [Fact]
    public void SafeguardsStatus_BecomesCompleteWithTheLastMandatoryPreparationTick_AndClearsTheAlarm()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Run(50, new TickItem(Kim, "airside", "P1"));
        Assert.Equal(["P2"], Status(d, 50).SafeguardsOutstanding);
        d.Run(60, new TickItem(Lee, "lighting", "P2"));
        Assert.True(Status(d, 60).SafeguardsComplete);
        Assert.Empty(Status(d, 60).SafeguardsOutstanding);
        var cleared = Assert.Single(d.Events.OfType<AlarmCleared>(), c => c.Key == AlarmKeys.SafeguardsIncomplete);
        Assert.Equal(EngineDriver.At(60), cleared.At);
    }

    [Fact]
    public void Preparation_WithoutTheActiveCondition_HasNoSafeguardsAlarm_ButSafeguardsAreNotComplete()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Run(40);
        Assert.Equal(Phase.Preparation, d.State.Phase);
        Assert.DoesNotContain(d.State.Alarms, a => a.Kind == AlarmKind.SafeguardsIncomplete);
        Assert.False(Status(d, 40).SafeguardsComplete);
    }

    [Fact]
    public void InNormal_SafeguardsAreNotComplete_AndNothingIsOutstanding()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        var status = Status(d, 10);
        Assert.False(status.SafeguardsComplete);
        Assert.Empty(status.SafeguardsOutstanding);
    }

    [Fact]
    public void SafeguardsAlarm_ClearsWhenTheActiveConditionNoLongerHolds_EvenWithItemsOpen()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Weather(60, 700); // 700 m is not below the active threshold 550 m (invented profile)
        Assert.Single(d.Events.OfType<AlarmCleared>(), c => c.Key == AlarmKeys.SafeguardsIncomplete && c.At == EngineDriver.At(60));
    }

    [Fact]
    public void Reinstatement_KeepsDonePreparationTicks_VoidsCancellationItems_AndReopensActiveItemsAfresh()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Run(40, new TickItem(Kim, "airside", "P1"), new TickItem(Lee, "lighting", "P2"), new TickItem("ash (invented)", "atc", "A1"));
        d.WeatherFromTo(60, 660, 700);
        d.Weather(700, 500);
        d.Run(760);
        Assert.Equal("30:Normal->Active; 660:Active->Cancellation; 730:Cancellation->Active", d.TransitionLog);
        Assert.Equal(Kim, d.State.Items.Single(i => i.ItemId == "P1").Tick!.User);
        Assert.Equal([ItemStatus.Voided, ItemStatus.Voided], d.State.Items.Where(i => i.Phase == Phase.Cancellation).Select(i => i.Status));
        var a1 = d.State.Items.Where(i => i.ItemId == "A1").ToList();
        Assert.Equal([(ItemStatus.Done, EngineDriver.At(30)), (ItemStatus.Open, EngineDriver.At(730))], a1.Select(i => (i.Status, i.OpenedAt)));
        Assert.True(Status(d, 760).SafeguardsComplete);
        Assert.DoesNotContain(d.State.Alarms, a => a.Kind == AlarmKind.SafeguardsIncomplete);
    }

    [Fact]
    public void ActiveItemPastItsDueTime_RaisesItemOverdue_AtTheDueInstant()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.WeatherFromTo(60, 360, 500);
        var raised = Assert.Single(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == AlarmKeys.ItemOverdue("A1"));
        Assert.Equal(EngineDriver.At(330), raised.At);
        Assert.True(d.State.Items.Single(i => i.ItemId == "A1").IsOverdue(EngineDriver.At(330)));
        Assert.False(d.State.Items.Single(i => i.ItemId == "A1").IsOverdue(EngineDriver.At(329)));
    }

    [Fact]
    public void SecondTabletTickingAfterTheFirstCommitted_IsRefused_AndOnlyOneTickExists()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Run(50, new TickItem(Kim, "airside", "P1", "first tablet"));
        var second = d.Run(51, new TickItem(Lee, "airside", "P1", "second tablet"));
        Assert.Equal("item P1 already done by kim (invented) at 2026-12-01T03:00:50Z", Assert.Single(second.OfType<CommandRefused>()).Reason);
        Assert.Single(d.Events.OfType<ItemTicked>());
        var p1 = Assert.Single(d.State.Items, i => i.ItemId == "P1");
        Assert.Equal(new ItemTick(Kim, "airside", EngineDriver.At(50), "first tablet"), p1.Tick);
    }

    [Fact]
    public void UndoThenTickByAnother_RecordsBothTicksAndTheUndo_NothingLost()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Run(50, new TickItem(Kim, "airside", "P1"));
        d.Run(60, new UntickItem(Kim, "P1", "ticked the wrong item"));
        d.Run(70, new TickItem(Lee, "airside", "P1"));
        Assert.Equal([Kim, Lee], d.Events.OfType<ItemTicked>().Select(t => t.Tick.User));
        var undo = Assert.Single(d.Events.OfType<ItemUnticked>());
        Assert.Equal(Kim, undo.UndoneTick.User);
        Assert.Equal(Lee, Assert.Single(d.State.Items, i => i.ItemId == "P1").Tick!.User);
    }

    [Fact]
    public void UndoWithoutAReason_IsRefused_AndTheTickStays()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Run(50, new TickItem(Kim, "airside", "P1"));
        var refused = Assert.Single(d.Run(60, new UntickItem(Kim, "P1", " ")).OfType<CommandRefused>());
        Assert.Equal("a reason is required to undo a tick", refused.Reason);
        Assert.Equal(ItemStatus.Done, d.State.Items.Single(i => i.ItemId == "P1").Status);
    }

    [Fact]
    public void UndoOfAnOpenItem_IsRefused()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        var refused = Assert.Single(d.Run(50, new UntickItem(Kim, "P1", "mistake")).OfType<CommandRefused>());
        Assert.Equal("item P1 is not done", refused.Reason);
    }

    [Fact]
    public void TickAfterTheEpisodeEnded_IsRefusedAsClosed()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Run(50, new CancelLvp("dm (invented)", "improving (invented)"));
        var refused = Assert.Single(d.Run(60, new TickItem(Kim, "airside", "P1")).OfType<CommandRefused>());
        Assert.Equal("item P1 is closed: its episode ended", refused.Reason);
    }
}
