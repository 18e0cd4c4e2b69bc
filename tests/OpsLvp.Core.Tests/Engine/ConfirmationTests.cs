using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md R10: proposals, confirmation with both instants, withdrawal.</summary>
public class ConfirmationTests
{
    private const string Dm = "duty manager (invented)";

    [Fact]
    public void TransitionNeedingConfirmation_IsProposedWithAlarm_AndAppliedOnConfirm()
    {
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Normal, Phase.Preparation)));
        d.Weather(0, 800);
        d.Run(40);
        var proposal = Assert.Single(d.Events.OfType<TransitionProposed>());
        Assert.Equal(EngineDriver.At(30), proposal.At);
        Assert.Equal(Phase.Normal, d.State.Phase);
        Assert.Contains(d.State.Alarms, a => a.Kind == AlarmKind.PendingTransition);
        d.Run(50, new ConfirmPending(Dm));
        var t = Assert.Single(d.Transitions);
        Assert.Equal((EngineDriver.At(50), EngineDriver.At(30), TransitionBy.Manual, Dm), (t.At, t.ProposedAt, t.By, t.Actor));
        Assert.Single(d.Events.OfType<TransitionConfirmed>());
        Assert.DoesNotContain(d.State.Alarms, a => a.Kind == AlarmKind.PendingTransition);
    }

    [Fact]
    public void Pending_IsWithdrawnWhenItsConditionStopsHolding()
    {
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Normal, Phase.Preparation)));
        d.Weather(0, 800);
        d.Weather(45, 1050);
        var withdrawn = Assert.Single(d.Events.OfType<ProposalWithdrawn>());
        Assert.Equal((EngineDriver.At(45), "condition no longer holds"), (withdrawn.At, withdrawn.Reason));
        Assert.Null(d.State.Pending);
        Assert.Single(d.Events.OfType<AlarmCleared>(), c => c.Kind == AlarmKind.PendingTransition);
        Assert.Single(d.Run(50, new ConfirmPending(Dm)).OfType<CommandRefused>());
    }

    [Fact]
    public void Pending_IsWithdrawnAtTheInstantItsReadingsGoStale()
    {
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Normal, Phase.Preparation)));
        d.Weather(0, 800);
        d.Run(500);
        // RVR readings at 0 s are stale at 120 s (max age 120 s, invented)
        Assert.Equal(EngineDriver.At(120), Assert.Single(d.Events.OfType<ProposalWithdrawn>()).At);
    }

    [Fact]
    public void UnconfirmedTransitions_StayAutomatic()
    {
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Preparation, Phase.Active)));
        d.Weather(0, 800);
        d.Weather(40, 500);
        d.Run(100);
        Assert.Equal("30:Normal->Preparation", d.TransitionLog);
        Assert.Equal(EngineDriver.At(70), d.State.Pending?.ConditionMetAt);
    }

    [Fact]
    public void NewProposalReplacingAnother_RaisesThePendingAlarmAfreshWithItsOwnText()
    {
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Normal, Phase.Preparation), new TransitionRule(Phase.Normal, Phase.Active)));
        d.Run(0, [.. TestProfiles.GoverningRvr.Select(s => EngineDriver.Rvr(0, s, 800)), EngineDriver.Ceiling(0, 5000)]);
        d.Run(40, new AcknowledgeAlarm(Dm, "pending"));
        d.Weather(50, 500);
        d.Run(90);
        var pending = Assert.Single(d.State.Alarms, a => a.Key == "pending");
        // the engine's own text uses the vocabulary's words, not internal names or an arrow (LvpVocabulary)
        Assert.StartsWith("confirm Normal operations to LVP in force: ", pending.Message);
        Assert.DoesNotContain("->", pending.Message, StringComparison.Ordinal);
        Assert.False(pending.Acknowledged);
        Assert.Equal(2, d.Events.OfType<TransitionProposed>().Count());
    }
}
