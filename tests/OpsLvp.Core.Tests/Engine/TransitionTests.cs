using OpsLvp.Core.Engine;
using static OpsLvp.Core.Tests.Engine.EngineDriver;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md R4, R7, R8 with the invented test profile (preparation &lt; 1000 m / recover 1100 m, active &lt; 550 / 650 m, enter dwells 30 s, recover 15 / 10 min).</summary>
public class TransitionTests
{
    [Fact]
    public void PreparationCondition_HeldForItsDwell_EntersPreparationAtTheExactInstant()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Run(60);
        var t = Assert.Single(d.Transitions);
        Assert.Equal((Phase.Normal, Phase.Preparation, TransitionBy.Auto), (t.From, t.To, t.By));
        Assert.Equal(At(30), t.At);
        Assert.Equal("RVR 07 TDZ 800 m < 1000 m", t.Reason);
        Assert.Equal(800, t.Snapshot.GoverningRvrM);
    }

    [Fact]
    public void PreparationCondition_BrokenBeforeItsDwell_DoesNotEscalate()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Weather(29, 1050);
        d.Run(100);
        Assert.Empty(d.Transitions);
    }

    [Fact]
    public void ActiveCondition_FromNormal_GoesDirectlyToActiveAndOpensPreparationChecklistToo()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.Run(40);
        Assert.Equal("30:Normal->Active", d.TransitionLog);
        var opened = d.Events.OfType<ChecklistOpened>().Select(o => o.Phase).ToList();
        Assert.Equal([Phase.Preparation, Phase.Active], opened);
        Assert.Equal(["P1", "P2", "A1"], d.State.Items.Select(i => i.ItemId));
    }

    [Fact]
    public void LowestGoverningPosition_Governs()
    {
        var d = new EngineDriver();
        d.Run(0, Rvr(0, "RVR07T", 1500), Rvr(0, "RVR07M", 1400), Rvr(0, "RVR25T", 520), Ceiling(0, 5000));
        d.Run(40);
        var t = Assert.Single(d.Transitions);
        Assert.Equal("RVR 07 END 520 m < 550 m", t.Reason);
        Assert.Equal("RVR25T", t.Snapshot.GoverningRvrSensor);
    }

    [Fact]
    public void RvrOnARunwayNotListedForLvp_DoesNotGovern()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        d.Run(1, Rvr(1, "RVR12T", 300));
        d.Run(100);
        Assert.Empty(d.Transitions);
    }

    [Fact]
    public void Ceiling_BelowActiveThreshold_EscalatesEvenWithGoodRvr()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500, ceilingFt: 180);
        d.Run(40);
        Assert.Equal("ceiling 180 ft (CEIL1) < 200 ft", Assert.Single(d.Transitions).Reason);
    }

    [Fact]
    public void VerticalVisibility_CountsAsCeiling_OnlyWhenTheProfileSaysSo()
    {
        var vv = new ReadingInput(new Readings.Reading(At(0), "CEIL1", Readings.ReadingKind.VerticalVisibility, 150));
        var on = new EngineDriver();
        on.Weather(0, 1500);
        on.Run(0, vv);
        on.Run(40);
        Assert.Equal(Phase.Active, on.State.Phase);
        var off = new EngineDriver(TestProfiles.Standard() with { VerticalVisibilityIsCeiling = false });
        off.Weather(0, 1500);
        off.Run(0, vv);
        off.Run(40);
        Assert.Equal(Phase.Normal, off.State.Phase);
    }

    [Fact]
    public void PreparationThenActive_EachAfterItsOwnDwell()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.Weather(40, 500);
        d.Run(100);
        Assert.Equal("30:Normal->Preparation; 70:Preparation->Active", d.TransitionLog);
    }

    [Fact]
    public void Active_RecoveryHeldTenMinutes_EntersCancellationAtTheExactInstant()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.WeatherFromTo(60, 700, 700);
        Assert.Equal("30:Normal->Active; 660:Active->Cancellation", d.TransitionLog);
        Assert.Equal(["C1", "C2"], d.Events.OfType<ChecklistOpened>().Last().ItemIds);
    }

    [Fact]
    public void Active_RecoveryInTheHysteresisBand_DoesNotRelax()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.WeatherFromTo(60, 1200, 600); // 550 <= 600 < 650: neither active nor recovered
        Assert.Equal("30:Normal->Active", d.TransitionLog);
    }

    [Fact]
    public void Cancellation_EndsToPreparation_WhenItemsDoneBeforeRecoveryFromPreparationHeld()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.WeatherFromTo(60, 700, 700);
        d.Run(700, new TickItem("kim (invented)", "airside", "C1"));
        Assert.Equal("30:Normal->Active; 660:Active->Cancellation; 700:Cancellation->Preparation", d.TransitionLog);
    }

    [Fact]
    public void Cancellation_EndsToNormal_WhenRecoveryFromPreparationHeldByThen()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.WeatherFromTo(60, 1020, 1200);
        d.Run(1020, new TickItem("kim (invented)", "airside", "C1"));
        // recovery from preparation held since 60 s, its 15 min dwell done at 960 s
        Assert.Equal("30:Normal->Active; 660:Active->Cancellation; 1020:Cancellation->Normal", d.TransitionLog);
        Assert.Single(d.Events.OfType<EpisodeEnded>());
        Assert.Null(d.State.Episode);
    }

    [Fact]
    public void Cancellation_EndsAtOnce_WhenNoCancellationItemIsMandatory()
    {
        var profile = TestProfiles.Standard() with
        {
            Checklists = TestProfiles.Standard().Checklists with { Cancellation = [new OpsLvp.Core.Profile.ChecklistItemConfig("C2", "Log (invented)", "lighting", false, 30)] },
        };
        var d = new EngineDriver(profile);
        d.Weather(0, 500);
        d.WeatherFromTo(60, 700, 700);
        Assert.Equal("30:Normal->Active; 660:Active->Cancellation; 660:Cancellation->Preparation", d.TransitionLog);
    }

    [Fact]
    public void Cancellation_ActiveConditionHeldAgain_ReinstatesActiveAndVoidsOpenCancellationItems()
    {
        var d = new EngineDriver();
        d.Weather(0, 500);
        d.WeatherFromTo(60, 660, 700);
        d.Weather(700, 500);
        d.Run(760);
        Assert.Equal("30:Normal->Active; 660:Active->Cancellation; 730:Cancellation->Active", d.TransitionLog);
        Assert.StartsWith("re-instated: RVR", d.Transitions.Last().Reason);
        var voided = Assert.Single(d.Events.OfType<ItemsClosed>());
        Assert.Equal(ItemStatus.Voided, voided.Status);
        Assert.Equal(["C1", "C2"], voided.ItemIds);
    }

    [Fact]
    public void Preparation_RecoveryHeldFifteenMinutes_ReturnsToNormalAndEndsTheEpisode()
    {
        var d = new EngineDriver();
        d.Weather(0, 800);
        d.WeatherFromTo(60, 1000, 1200);
        Assert.Equal("30:Normal->Preparation; 960:Preparation->Normal", d.TransitionLog);
        var closed = Assert.Single(d.Events.OfType<ItemsClosed>());
        Assert.Equal(ItemStatus.ClosedNotDone, closed.Status);
    }

    [Fact]
    public void DeteriorationForecast_IsAPreparationCondition()
    {
        var d = new EngineDriver();
        d.Weather(0, 5000);
        d.Run(10, new SetForecast("dm (invented)", true, "TAF shows fog after 04Z (invented)"));
        d.Run(50);
        Assert.Equal("40:Normal->Preparation", d.TransitionLog);
        Assert.Equal("deterioration forecast", d.Transitions.Single().Reason);
    }
}
