using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Console;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Console;

/// <summary>What the duty console prints, from <see cref="ConsoleViewModel"/> (issue 13). Names, items and times are invented.</summary>
public sealed class ConsoleViewModelTests
{
    private static readonly CommandCaller Dm = new("dana (invented)", new HashSet<string> { Roles.DutyManager }, new HashSet<string>(), true);

    private static readonly CommandCaller Viewer = new("viv (invented)", new HashSet<string> { Roles.Viewer }, new HashSet<string>(), true);

    [Fact]
    public void TeamProgress_CountsTheCurrentPhasesItemsOnly_WithTheCountInWordsBesideTheBar()
    {
        // in force: the preparation items (all done) no longer count; the active items do
        var snapshot = TestSnapshots.Make(1, phase: Phase.Active, items:
        [
            TestSnapshots.Item("P1", "airside", ItemStatus.Done, tick: new ItemTick("kim (invented)", "airside", TestSnapshots.T0, null)),
            TestSnapshots.Item("P2", "lighting", ItemStatus.Done, tick: new ItemTick("ash (invented)", "lighting", TestSnapshots.T0, null)),
            TestSnapshots.Item("A1", "airside", phase: Phase.Active, overdue: true),
            TestSnapshots.Item("A2", "airside", ItemStatus.Done, phase: Phase.Active, tick: new ItemTick("kim (invented)", "airside", TestSnapshots.T0, null)),
        ]);

        var view = ConsoleViewModel.Build(snapshot, TestSnapshots.T0.AddMinutes(5), Dm);

        var team = Assert.Single(view.Teams);
        Assert.Equal("airside", team.Team);
        Assert.Equal("1 of 2 done · 1 overdue", team.CountText);
        Assert.Equal("Airside Ops (invented): 1 of 2 done · 1 overdue", team.AriaLabel);
        Assert.Equal(50.0, team.Percent);
        Assert.True(team.Overdue);
        Assert.Equal("overdue", team.CssClass);
        Assert.Equal("LVP in force items by team", view.TeamsTitle);
    }

    [Fact]
    public void OpenSafeguards_AreNamedByTheirTexts_InTheLine_TheNotes_AndTheButtons()
    {
        var snapshot = TestSnapshots.Make(1, phase: Phase.Preparation, items: [TestSnapshots.Item("P1", "airside"), TestSnapshots.Item("P2", "lighting")]);
        snapshot = snapshot with
        {
            Status = snapshot.Status with
            {
                SafeguardsOutstanding = ["P1", "P2"],
                ConditionsMetSafeguardsIncomplete = true,
                Waiting = [new WaitingFor(WaitKind.Safeguards, "LVP conditions met — safeguards incomplete: P1, P2 open", null, null, ["P1", "P2"])],
            },
        };

        var view = ConsoleViewModel.Build(snapshot, TestSnapshots.T0.AddMinutes(5), Dm);

        Assert.Equal("safeguards incomplete, outstanding: Item P1 (invented); Item P2 (invented)", view.SafeguardsText);
        Assert.Equal(["LVP conditions met — safeguards incomplete: Item P1 (invented); Item P2 (invented) open"], view.PhaseNotes);
        Assert.Equal(["Item P1 (invented): not applicable…", "Item P2 (invented): not applicable…"], view.Safeguards.Select(s => s.ButtonLabel));
        Assert.Equal(["P1", "P2"], view.Safeguards.Select(s => s.ItemId));
        Assert.Equal(["LVP conditions met — safeguards incomplete: Item P1 (invented); Item P2 (invented) open"], view.Waiting);
        Assert.Equal("LVP CONDITIONS MET — SAFEGUARDS INCOMPLETE", view.PhaseText);
        Assert.Equal("phase-warning", view.PhaseClass);
    }

    [Fact]
    public void TimesAndValues_ComeFromTheOneFormatter_AgainstTheServersClock()
    {
        var pending = new PendingTransition(
            Phase.Preparation, Phase.Active, TestSnapshots.T0.AddMinutes(1).AddSeconds(40), "RVR 07 TDZ 500 m < 550 m",
            new ConditionSnapshot(TestSnapshots.T0.AddMinutes(1).AddSeconds(40), 500, "RVR07T", null, null, false, true, TestSnapshots.Thresholds));
        var snapshot = TestSnapshots.Make(1, pending: pending, hold: new Hold(Phase.Preparation, "dana (invented)", "precaution (invented)", TestSnapshots.T0));

        var view = ConsoleViewModel.Build(snapshot, TestSnapshots.T0.AddMinutes(5), Dm);

        Assert.Equal("since 03:00:00Z (5 min)", view.PhaseSince);
        Assert.Equal("500 m at 07 TDZ (RVR07T)", view.GoverningRvrText);
        Assert.Null(view.CeilingText);
        Assert.Equal("LVP preparation declared by dana (invented) at 03:00Z: precaution (invented)", view.HoldText);
        Assert.True(view.ShowReleaseHold);
        Assert.Equal(new ConsolePending("LVP preparation to LVP in force: RVR 07 TDZ 500 m < 550 m", "proposed 03:01:40Z, pending for 3 min 20 s", "Confirm LVP in force…"), view.Pending);
        Assert.Equal(["500 m", "600 m", "—"], view.Runways.Single().Positions.Select(p => p.Value));
        Assert.Equal("RWY 07", view.Runways.Single().Title);
    }

    [Fact]
    public void AViewer_GetsTheViewOnlyLine_ADutyManagerDoesNot()
    {
        var snapshot = TestSnapshots.Make(1);
        Assert.Equal("Signed in as viv (invented): view only (duty managers act here)", ConsoleViewModel.Build(snapshot, TestSnapshots.T0, Viewer).ReadOnlyText);
        Assert.False(ConsoleViewModel.Build(snapshot, TestSnapshots.T0, Viewer).IsDutyManager);
        Assert.Null(ConsoleViewModel.Build(snapshot, TestSnapshots.T0, Dm).ReadOnlyText);
        Assert.Equal("Not signed in: view only", ConsoleViewModel.Build(snapshot, TestSnapshots.T0, CommandCaller.Anonymous).ReadOnlyText);
    }

    [Fact]
    public void Sensors_AndForecast_SayWhatTheirButtonsWouldDo()
    {
        var snapshot = TestSnapshots.Make(1, forecast: true, outOfService: ["RVR07M"]);
        var view = ConsoleViewModel.Build(snapshot, TestSnapshots.T0, Dm);
        Assert.Equal(
            [("RVR07M", "RVR07M (out of service)", "Back in service…"), ("RVR07T", "RVR07T", "Out of service…")],
            view.Sensors.Select(s => (s.SensorId, s.Label, s.ButtonLabel)));
        Assert.Equal((true, "Clear forecast…"), (view.ForecastOn, view.ForecastButton));
    }

    [Fact]
    public void InNormal_NoEpisode_NoTeams_NoSafeguardButtons()
    {
        var view = ConsoleViewModel.Build(TestSnapshots.Make(1, phase: Phase.Normal), TestSnapshots.T0, Dm);
        Assert.Equal("no episode running", view.EpisodeText);
        Assert.Empty(view.Teams);
        Assert.Equal("no items: no episode running", view.TeamsEmptyText);
        Assert.Empty(view.Safeguards);
        Assert.Equal("safeguards: not applicable (normal operations)", view.SafeguardsText);
    }
}
