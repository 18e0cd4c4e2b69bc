using Bunit;
using Bunit.Rendering;
using MudBlazor;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Console;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Console;

/// <summary>The duty console: what it shows, and that each action asks a reason in a dialog and sends the right command. Values are invented.</summary>
public sealed class DutyConsoleTests : LiveComponentTest
{
    private const string Dm = "dana (invented)";

    private static readonly PendingTransition Pending = new(
        Phase.Preparation, Phase.Active, TestSnapshots.T0.AddMinutes(1).AddSeconds(40), "RVR 07 TDZ 500 m < 550 m",
        new ConditionSnapshot(TestSnapshots.T0.AddMinutes(1).AddSeconds(40), 500, "RVR07T", null, null, false, true, TestSnapshots.Thresholds));

    private IRenderedComponent<ContainerFragment> RenderConsole() => Render(b =>
    {
        b.OpenComponent<MudPopoverProvider>(0);
        b.CloseComponent();
        b.OpenComponent<MudDialogProvider>(1);
        b.CloseComponent();
        b.OpenComponent<MudSnackbarProvider>(2);
        b.CloseComponent();
        b.OpenComponent<DutyConsole>(3);
        b.CloseComponent();
    });

    private static void TypeReason(IRenderedComponent<ContainerFragment> cut, string reason) =>
        cut.Find("[data-testid=reason-dialog] textarea").Input(reason);

    [Fact]
    public void PendingTransition_ShowsHowLongItHasBeenPending()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, pending: Pending, at: TestSnapshots.T0.AddMinutes(5)));
        Clock.SetUtcNow(TestSnapshots.T0.AddMinutes(5));
        var cut = RenderConsole();
        Assert.Contains("LVP preparation to LVP in force: RVR 07 TDZ 500 m < 550 m", cut.Find("[data-testid=console-pending-text]").TextContent);
        Assert.Equal("proposed 03:01:40Z, pending for 3 min 20 s", cut.Find("[data-testid=console-pending-age]").TextContent.Trim());
    }

    [Fact]
    public void Confirm_AsksAReason_SubmitDisabledUntilGiven_ThenSendsConfirmPending()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, pending: Pending));
        var cut = RenderConsole();

        cut.Find("[data-testid=console-confirm]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        Assert.True(cut.Find("[data-testid=reason-submit]").HasAttribute("disabled"));
        TypeReason(cut, "   ");
        Assert.True(cut.Find("[data-testid=reason-submit]").HasAttribute("disabled"));
        TypeReason(cut, "tower agrees (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Single(Commands.Calls));
        var (caller, command) = Commands.Calls[0];
        Assert.Equal(Dm, caller.Name);
        Assert.Equal(new ConfirmPending(Dm, "tower agrees (invented)"), command);
    }

    [Theory]
    [InlineData("console-declare-preparation", Phase.Preparation)]
    [InlineData("console-declare-active", Phase.Active)]
    public void Declare_SendsDeclarePhaseWithTheReason(string button, Phase phase)
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, phase: Phase.Normal));
        var cut = RenderConsole();

        cut.Find($"[data-testid={button}]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "fog bank on approach (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Equal(new DeclarePhase(Dm, phase, "fog bank on approach (invented)"), Assert.Single(Commands.Calls).Command));
    }

    [Fact]
    public void Cancel_Back_SendsNothing_ThenWithAReason_SendsCancelLvp()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, phase: Phase.Active));
        var cut = RenderConsole();

        cut.Find("[data-testid=console-cancel]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        cut.Find("[data-testid=reason-cancel]").Click();
        cut.WaitForAssertion(() => Assert.Empty(cut.FindAll("[data-testid=reason-dialog]")));
        Assert.Empty(Commands.Calls);

        cut.Find("[data-testid=console-cancel]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "visibility recovered (invented)");
        cut.Find("[data-testid=reason-submit]").Click();
        cut.WaitForAssertion(() => Assert.Equal(new CancelLvp(Dm, "visibility recovered (invented)"), Assert.Single(Commands.Calls).Command));
    }

    [Fact]
    public void ReleaseHold_ShownOnlyWithAHold_AndSendsReleaseHold()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1));
        var cut = RenderConsole();
        Assert.Empty(cut.FindAll("[data-testid=console-release-hold]"));

        cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, hold: new Hold(Phase.Preparation, Dm, "precaution (invented)", TestSnapshots.T0))));
        cut.WaitForElement("[data-testid=console-release-hold]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "conditions settled (invented)");
        cut.Find("[data-testid=reason-submit]").Click();
        cut.WaitForAssertion(() => Assert.Equal(new ReleaseHold(Dm, "conditions settled (invented)"), Assert.Single(Commands.Calls).Command));
    }

    [Fact]
    public void ForecastAndSensorToggles_SendTheOppositeOfTheCurrentState()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, forecast: true, outOfService: ["RVR07M"]));
        var cut = RenderConsole();

        cut.Find("[data-testid=console-forecast-toggle]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "fog no longer expected (invented)");
        cut.Find("[data-testid=reason-submit]").Click();
        cut.WaitForAssertion(() => Assert.Single(Commands.Calls));

        cut.Find("[data-sensor-id=RVR07M] [data-testid=console-sensor-toggle]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "repaired (invented)");
        cut.Find("[data-testid=reason-submit]").Click();
        cut.WaitForAssertion(() => Assert.Equal(2, Commands.Calls.Count));

        Assert.Equal(new SetForecast(Dm, false, "fog no longer expected (invented)"), Commands.Calls[0].Command);
        Assert.Equal(new SetSensorService(Dm, "RVR07M", true, "repaired (invented)"), Commands.Calls[1].Command);
    }

    [Fact]
    public void LightStep_ShowsWhoSetIt_AndEachStepButtonSendsSetLightStep()
    {
        // docs/engine.md R20; steps, names and reasons invented
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1) with
        {
            LightStep = new OpsLvp.Core.Optics.LightStepInUse(3, OpsLvp.Core.Optics.LightStepOrigin.Manual, "lee (invented)", TestSnapshots.T0, false),
            LightSteps = [0, 3, 5],
        });
        var cut = RenderConsole();
        Assert.Equal("3 (set by lee (invented) at 03:00Z)", cut.Find("[data-testid=console-light-step]").TextContent.Trim());
        Assert.Equal(["0", "3", "5"], cut.FindAll("[data-testid=console-light-step-set]").Select(b => b.GetAttribute("data-step")));

        cut.Find("[data-testid=console-light-step-set][data-step='0']").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "runway lights failed (invented)");
        cut.Find("[data-testid=reason-submit]").Click();
        cut.WaitForAssertion(() => Assert.Single(Commands.Calls));
        Assert.Equal(new SetLightStep(Dm, 0, "runway lights failed (invented)"), Commands.Calls[0].Command);
    }

    [Theory]
    [InlineData(0.0, "Sensor", "agl", false, "0, lights off (lighting sensor agl)")]
    [InlineData(null, "Sensor", "agl", true, "unknown (lighting sensor agl stale) — lowest configured intensity used")]
    [InlineData(5.0, "Profile", null, false, "5 (profile starting value)")]
    public void LightStepText_SaysTheStepAndItsOrigin(double? step, string origin, string? source, bool unknown, string expected) =>
        Assert.Equal(expected, DutyConsole.LightStepText(new OpsLvp.Core.Optics.LightStepInUse(step, Enum.Parse<OpsLvp.Core.Optics.LightStepOrigin>(origin), source, null, unknown)));

    [Fact]
    public void RefusedOutcome_IsShownAsASnackbar()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, phase: Phase.Normal));
        Commands.NextOutcome = new CommandOutcome(CommandOutcomeKind.Refused, "nothing to cancel: the phase is normal");
        var cut = RenderConsole();
        cut.Find("[data-testid=console-cancel]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "test (invented)");
        cut.Find("[data-testid=reason-submit]").Click();
        cut.WaitForAssertion(() => Assert.Contains("nothing to cancel: the phase is normal", cut.Markup));
        var snackbar = Assert.Single(Services.GetService<ISnackbar>()!.ShownSnackbars);
        Assert.Equal(Severity.Warning, snackbar.Severity);
    }

    [Theory]
    [InlineData(Roles.Viewer)]
    [InlineData(Roles.GroundStaff)]
    public void NonDutyManagers_SeeTheStatus_ButNoActionButtons(string role)
    {
        SignIn("viv (invented)", role, "airside");
        Live.Set(TestSnapshots.Make(1, pending: Pending, hold: new Hold(Phase.Preparation, Dm, "precaution (invented)", TestSnapshots.T0)));
        var cut = RenderConsole();
        Assert.NotNull(cut.Find("[data-testid=console-pending-text]"));
        Assert.Empty(cut.FindAll("[data-testid=console-actions]"));
        Assert.Empty(cut.FindAll("[data-testid=console-confirm]"));
        Assert.Contains("view only", cut.Find("[data-testid=console-readonly]").TextContent);
    }

    [Fact]
    public void ShowsWaitingForAndEachTeamsProgress()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1,
            waiting: [new WaitingFor(WaitKind.RecoveryDwell, "recovery from preparation held 6 of 15 min", 360, 900, [])],
            items:
            [
                TestSnapshots.Item("P1", "airside", ItemStatus.Done, tick: new ItemTick("kim (invented)", "airside", TestSnapshots.T0, null)),
                TestSnapshots.Item("P3", "airside", overdue: true),
                TestSnapshots.Item("P2", "lighting"),
                TestSnapshots.Item("C1", "lighting", ItemStatus.Voided, phase: Phase.Cancellation),
            ]));
        var cut = RenderConsole();
        Assert.Equal("recovery from preparation held 6 of 15 min", cut.Find("[data-testid=console-wait]").TextContent.Trim());
        Assert.Equal("1 of 2 done · 1 overdue", cut.Find("[data-team=airside] [data-testid=console-team-count]").TextContent.Trim());
        Assert.Equal("0 of 1 done", cut.Find("[data-team=lighting] [data-testid=console-team-count]").TextContent.Trim());
    }

    [Theory]
    [InlineData(Phase.Active, false, "LVP IN FORCE")]
    [InlineData(Phase.Preparation, true, "LVP CONDITIONS MET — SAFEGUARDS INCOMPLETE")]
    [InlineData(Phase.Preparation, false, "LVP PREPARATION")]
    public void Phase_SaysInForceOnlyWhenTheEngineIsInForce(Phase phase, bool conditionsMet, string expected)
    {
        // docs/sources.md "LVP phases": in force only once safeguarding is complete (EUR Doc 013, from memory);
        // docs/engine.md R13: the engine holds preparation and flags it while the active condition is met.
        SignIn(Dm, Roles.DutyManager);
        var snapshot = TestSnapshots.Make(1, phase: phase, safeguardsComplete: !conditionsMet);
        Live.Set(snapshot with { Status = snapshot.Status with { ConditionsMetSafeguardsIncomplete = conditionsMet } });
        var cut = RenderConsole();
        Assert.Equal(expected, cut.Find("[data-testid=console-phase]").TextContent.Trim());
    }

    [Fact]
    public void DeclareOverOpenSafeguards_SendsDeclarePhaseWithTheOverrideReason()
    {
        // docs/engine.md R13
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, phase: Phase.Preparation));
        var cut = RenderConsole();

        cut.Find("[data-testid=console-declare-override]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "tower asks for LVP now (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Equal(
            new DeclarePhase(Dm, Phase.Active, "tower asks for LVP now (invented)", "tower asks for LVP now (invented)"),
            Assert.Single(Commands.Calls).Command));
    }

    [Fact]
    public void ConditionsMetWithSafeguardsOpen_IsSaidBesideThePhase()
    {
        // docs/engine.md R13, R15 (StatusNotes wording)
        SignIn(Dm, Roles.DutyManager);
        var snapshot = TestSnapshots.Make(1, phase: Phase.Preparation);
        Live.Set(snapshot with
        {
            Status = snapshot.Status with
            {
                ConditionsMetSafeguardsIncomplete = true,
                SafeguardsOutstanding = ["P1"],
                RelaxedAgainstConditions = null,
            },
        });
        var cut = RenderConsole();
        Assert.Equal("LVP conditions met — safeguards incomplete: P1 open", Assert.Single(cut.FindAll("[data-testid=console-phase-note]")).TextContent.Trim());
    }

    [Fact]
    public void OpenSafeguard_CanBeMarkedNotApplicable_WithAReason()
    {
        SignIn(Dm, Roles.DutyManager);
        var snapshot = TestSnapshots.Make(1, phase: Phase.Preparation);
        Live.Set(snapshot with { Status = snapshot.Status with { SafeguardsOutstanding = ["P2"] } });
        var cut = RenderConsole();

        cut.Find("[data-testid=console-not-applicable]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "no stop bars on this runway (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Equal(new MarkNotApplicable(Dm, "P2", "no stop bars on this runway (invented)"), Assert.Single(Commands.Calls).Command));
    }

    [Fact]
    public void OutstandingSafeguards_AreListedByTheirItemTexts_NotTheirIds()
    {
        SignIn(Dm, Roles.DutyManager);
        var snapshot = TestSnapshots.Make(1, phase: Phase.Active, items: [TestSnapshots.Item("P1", "airside")]);
        Live.Set(snapshot with { Status = snapshot.Status with { SafeguardsOutstanding = ["P1"] } });
        var cut = RenderConsole();

        Assert.Equal("safeguards incomplete, outstanding: Item P1 (invented)", cut.Find("[data-testid=console-safeguards]").TextContent.Trim());
    }
}
