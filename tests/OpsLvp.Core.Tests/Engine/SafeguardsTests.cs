using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R13: LVP are in force (active) only once the aerodrome is safeguarded — every mandatory
/// preparation item done or marked not applicable (common practice: the measures are in place before LVP are
/// declared in force). Thresholds, dwells and items are the invented test profile's (TestProfiles).
/// </summary>
public class SafeguardsTests
{
    private const string Dm = "duty manager (invented)";

    [Fact]
    public void ActiveCondition_WithSafeguardsOpen_HoldsPreparation_AndSaysWhy()
    {
        var d = new EngineDriver(TestProfiles.Safeguarded());
        d.WeatherFromTo(0, 120, 500);
        // 500 m < 550 m held 30 s (invented dwell): conditions met, but P1 and P2 (mandatory) are open
        Assert.Equal("30:Normal->Preparation", d.TransitionLog);
        Assert.Contains(LvpEngine.SafeguardsIncompleteHeadline, Assert.Single(d.Transitions).Reason, StringComparison.Ordinal);
        var status = d.Engine.Describe(d.State, EngineDriver.At(120));
        Assert.True(status.ConditionsMetSafeguardsIncomplete);
        Assert.Equal(["P1", "P2"], status.SafeguardsOutstanding);
        var wait = Assert.Single(status.Waiting, w => w.Kind == WaitKind.Safeguards);
        Assert.Equal("LVP conditions met — safeguards incomplete: P1, P2 open", wait.Text);
        Assert.Equal(["LVP conditions met — safeguards incomplete: P1, P2 open"], StatusNotes.For(status));
        Assert.Contains(d.State.Alarms, a => a.Kind == AlarmKind.SafeguardsIncomplete);
    }

    [Fact]
    public void LastSafeguardDone_EntersActiveAtThatInstant()
    {
        var d = new EngineDriver(TestProfiles.Safeguarded());
        d.WeatherFromTo(0, 60, 500);
        d.Run(70, new TickItem("kim (invented)", "airside", "P1"));
        Assert.Equal(Phase.Preparation, d.State.Phase);
        d.Weather(100, 500);
        d.Run(105.5, new TickItem("lee (invented)", "lighting", "P2"));
        Assert.Equal("30:Normal->Preparation; 105.5:Preparation->Active", d.TransitionLog);
        Assert.False(d.Engine.Describe(d.State, EngineDriver.At(106)).ConditionsMetSafeguardsIncomplete);
        Assert.DoesNotContain(d.State.Alarms, a => a.Kind == AlarmKind.SafeguardsIncomplete);
    }

    [Fact]
    public void NotApplicable_CountsAsDone_IsAudited_AndCanBeUndone()
    {
        var d = new EngineDriver(TestProfiles.Safeguarded());
        d.WeatherFromTo(0, 60, 500);
        d.Run(61, new TickItem("kim (invented)", "airside", "P1"));
        var events = d.Run(62, new MarkNotApplicable(Dm, "P2", "no stop bars on this runway (invented)"));
        var mark = Assert.Single(events.OfType<ItemMarkedNotApplicable>());
        Assert.Equal(("P2", Dm, "no stop bars on this runway (invented)"), (mark.ItemId, mark.Actor, mark.Reason));
        Assert.Equal("30:Normal->Preparation; 62:Preparation->Active", d.TransitionLog);
        var refused = Assert.Single(d.Run(63, new MarkNotApplicable(Dm, "P1", "  ")).OfType<CommandRefused>());
        Assert.Equal("a reason is required to mark an item not applicable", refused.Reason);
        Assert.Single(d.Run(64, new UntickItem(Dm, "P2", "stop bars do exist (invented)")).OfType<ItemUnticked>());
        Assert.Equal(ItemStatus.Open, d.State.Items.Last(i => i.ItemId == "P2").Status);
    }

    [Fact]
    public void DeclaringActive_WithSafeguardsOpen_IsRefusedWithTheList_UnlessOverridden()
    {
        var d = new EngineDriver(TestProfiles.Safeguarded());
        d.Weather(0, 2000);
        var refused = Assert.Single(d.Run(10, new DeclarePhase(Dm, Phase.Active, "fog bank at the threshold (invented)")).OfType<CommandRefused>());
        Assert.Equal("safeguards incomplete: P1, P2 open; declare active with an override reason to enter it anyway", refused.Reason);
        Assert.Equal(Phase.Normal, d.State.Phase);

        var events = d.Run(20, new DeclarePhase(Dm, Phase.Active, "fog bank at the threshold (invented)", "tower asks for LVP now (invented)"));
        Assert.Contains(events.OfType<ManualActionApplied>(), m => m.Action == "override_safeguards" && m.Reason == "tower asks for LVP now (invented)");
        var t = Assert.Single(d.Transitions);
        Assert.Equal((Phase.Normal, Phase.Active, TransitionBy.Manual), (t.From, t.To, t.By));
        Assert.Equal(["P1", "P2"], d.State.SafeguardsOverride?.OpenItems);
        var status = d.Engine.Describe(d.State, EngineDriver.At(21));
        Assert.StartsWith("in force over open safeguards: override by duty manager (invented)", StatusNotes.For(status).Single(), StringComparison.Ordinal);
    }

    [Fact]
    public void OverrideWithABlankReason_IsRefused()
    {
        var d = new EngineDriver(TestProfiles.Safeguarded());
        var refused = Assert.Single(d.Run(10, new DeclarePhase(Dm, Phase.Active, "fog (invented)", " ")).OfType<CommandRefused>());
        Assert.Equal("a reason is required to override open safeguards", refused.Reason);
    }

    [Fact]
    public void ProfileWithoutTheRule_KeepsDirectEntryToActive()
    {
        // inForceNeedsSafeguards: false is a local choice (docs/engine.md R13)
        var d = new EngineDriver(TestProfiles.Standard());
        d.WeatherFromTo(0, 60, 500);
        Assert.Equal("30:Normal->Active", d.TransitionLog);
    }

    [Fact]
    public void WithSafeguardsDoneBeforehand_PreparationGoesToActiveAfterTheActiveDwell()
    {
        var d = new EngineDriver(TestProfiles.Safeguarded());
        d.WeatherFromTo(0, 60, 800);
        d.Run(61, new TickItem("kim (invented)", "airside", "P1"), new TickItem("lee (invented)", "lighting", "P2"));
        d.WeatherFromTo(120, 240, 500);
        Assert.Equal("30:Normal->Preparation; 150:Preparation->Active", d.TransitionLog);
    }

    [Fact]
    public void PreparationToActiveNeedingConfirmation_IsProposedWhenTheLastSafeguardIsDone()
    {
        var d = new EngineDriver(TestProfiles.Safeguarded() with
        {
            Confirm = [new TransitionRule(Phase.Normal, Phase.Active), new TransitionRule(Phase.Preparation, Phase.Active)],
        });
        d.WeatherFromTo(0, 60, 500);
        Assert.Null(d.State.Pending);
        d.Run(70, new TickItem("kim (invented)", "airside", "P1"), new TickItem("lee (invented)", "lighting", "P2"));
        var proposal = Assert.Single(d.Events.OfType<TransitionProposed>());
        Assert.Equal((EngineDriver.At(70), Phase.Preparation, Phase.Active), (proposal.At, proposal.From, proposal.To));
    }

    [Fact]
    public void UndoingASafeguardWhileActiveIsPending_WithdrawsTheProposalSayingWhy()
    {
        var d = new EngineDriver(TestProfiles.Safeguarded() with { Confirm = [new TransitionRule(Phase.Preparation, Phase.Active)] });
        d.WeatherFromTo(0, 60, 500);
        d.Run(70, new TickItem("kim (invented)", "airside", "P1"), new TickItem("lee (invented)", "lighting", "P2"));
        Assert.NotNull(d.State.Pending);
        var withdrawn = Assert.Single(d.Run(80, new UntickItem(Dm, "P2", "stop bar 3 unserviceable (invented)")).OfType<ProposalWithdrawn>());
        Assert.Equal("LVP conditions met — safeguards incomplete: P2 open", withdrawn.Reason);
        Assert.Equal(Phase.Preparation, d.State.Phase);
    }
}
