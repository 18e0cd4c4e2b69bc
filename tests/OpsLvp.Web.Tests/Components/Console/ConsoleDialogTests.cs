using Bunit;
using Bunit.Rendering;
using MudBlazor;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Console;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Console;

/// <summary>
/// Issue 13 "Console that answers": the reason dialog has the focus and is not red on opening; "Cancel LVP" shows the
/// values it acts against beside the recovery thresholds and asks a second time when the engine says the conditions
/// still call for LVP (docs/engine.md R15, R40); "Set deterioration forecast" says whether it moves the state; every
/// outcome, and a confirm whose proposal went away while the reason was typed, is told in a snackbar. The previews come
/// from the real Core engine on an invented profile (<see cref="ConsoleEngine"/>).
/// </summary>
public sealed class ConsoleDialogTests : LiveComponentTest
{
    private const string Dm = "dana (invented)";

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

    private IRenderedComponent<ContainerFragment> ConsoleOn(ConsoleEngine engine)
    {
        SignIn(Dm, Roles.DutyManager);
        Clock.SetUtcNow(engine.Now);
        Live.Set(engine.Snapshot(1));
        Previews.Use(engine.Engine, engine.State, engine.Now);
        return RenderConsole();
    }

    [Fact]
    public void ReasonBox_HasTheFocusOnOpening_AndIsNotRed_UntilTypedAndCleared()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, phase: Phase.Normal));
        var cut = RenderConsole();

        cut.Find("[data-testid=console-declare-preparation]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");

        // the reason box asked the browser for the focus (ElementReference.FocusAsync)
        cut.WaitForAssertion(() => Assert.Contains(JSInterop.Invocations, i => i.Identifier.EndsWith("focus", StringComparison.OrdinalIgnoreCase)));
        Assert.Empty(cut.FindAll("[data-testid=reason-dialog] .mud-input-error"));
        Assert.DoesNotContain(ReasonDialog.ReasonMissing, cut.Markup, StringComparison.Ordinal);

        TypeReason(cut, "fog (invented)");
        Assert.Empty(cut.FindAll("[data-testid=reason-dialog] .mud-input-error"));
        TypeReason(cut, "");
        cut.WaitForAssertion(() => Assert.Contains(ReasonDialog.ReasonMissing, cut.Markup, StringComparison.Ordinal));
        Assert.NotEmpty(cut.FindAll("[data-testid=reason-dialog] .mud-input-error"));
        Assert.True(cut.Find("[data-testid=reason-submit]").HasAttribute("disabled"));
    }

    [Fact]
    public void CancelWhileConditionsStillCallForLvp_ShowsValuesBesideThresholds_AndAsksTwice()
    {
        // 500 m held 60 s: below active 550 m (invented thresholds): LVP in force, recovery needs 650 m or more
        var engine = new ConsoleEngine().Weather(500, 60);
        Assert.Equal(Phase.Active, engine.State.Phase);
        var cut = ConsoleOn(engine);

        cut.Find("[data-testid=console-cancel]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");

        var facts = cut.FindAll("[data-testid=reason-fact]").ToDictionary(r => r.QuerySelector("th")!.TextContent.Trim(), r => r.QuerySelector("td")!.TextContent.Trim());
        Assert.Equal("500 m", facts["RVR 07 TDZ"]);
        Assert.Equal("500 m", facts["RVR 07 MID"]);
        Assert.Equal("5000 ft", facts["Ceiling"]);
        Assert.Equal("650 m or more", facts["LVP in force recovers at RVR"]);
        Assert.Equal("Conditions still call for LVP in force.", cut.Find("[data-testid=reason-verdict]").TextContent.Trim());
        Assert.Equal("This will move the state to Cancelling LVP now (from LVP in force).", cut.Find("[data-testid=reason-effect]").TextContent.Trim());
        Assert.Empty(cut.FindAll("[data-testid=reason-second-ask]"));

        TypeReason(cut, "tower reports improving (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        // first submit: the second ask, nothing sent
        Assert.StartsWith("The conditions still call for LVP in force", cut.WaitForElement("[data-testid=reason-second-ask]").TextContent.Trim(), StringComparison.Ordinal);
        Assert.Equal("Cancel LVP against the conditions", cut.Find("[data-testid=reason-submit]").TextContent.Trim());
        Assert.Empty(Commands.Calls);

        cut.Find("[data-testid=reason-submit]").Click();
        cut.WaitForAssertion(() => Assert.Equal(new CancelLvp(Dm, "tower reports improving (invented)"), Assert.Single(Commands.Calls).Command));
        // the live state was not touched by the previews
        Assert.Equal(Phase.Active, engine.State.Phase);
    }

    [Fact]
    public void CancelOnceRecoveryHolds_AsksOnce()
    {
        // 500 m then 700 m: recovery from active (>= 650 m) holds, its dwell has not run (invented thresholds)
        var engine = new ConsoleEngine().Weather(500, 60).Weather(700, 30);
        Assert.Equal(Phase.Active, engine.State.Phase);
        var cut = ConsoleOn(engine);

        cut.Find("[data-testid=console-cancel]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        Assert.Equal("The conditions support cancelling: the recovery condition holds.", cut.Find("[data-testid=reason-verdict]").TextContent.Trim());
        TypeReason(cut, "visibility recovered (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Single(Commands.Calls));
        Assert.Empty(cut.FindAll("[data-testid=reason-second-ask]"));
    }

    [Fact]
    public void SetDeteriorationForecast_SaysItWillStartPreparation()
    {
        // 1500 m: normal; the forecast flag is a preparation condition (docs/engine.md R4), entry dwell 30 s (invented)
        var engine = new ConsoleEngine().Weather(1500, 20);
        Assert.Equal(Phase.Normal, engine.State.Phase);
        var cut = ConsoleOn(engine);

        cut.Find("[data-testid=console-forecast-toggle]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");

        Assert.Equal("This will move the state to LVP preparation within 30 s if the conditions hold (from Normal operations).",
            cut.Find("[data-testid=reason-effect]").TextContent.Trim());
        Assert.Empty(cut.FindAll("[data-testid=reason-facts]"));
        Assert.IsType<SetForecast>(Assert.Single(Previews.Previewed));
    }

    [Fact]
    public void Confirm_WhoseProposalWasWithdrawnWhileTheReasonWasTyped_IsNotSent_AndSaysSo()
    {
        SignIn(Dm, Roles.DutyManager);
        var pending = new PendingTransition(
            Phase.Preparation, Phase.Active, TestSnapshots.T0.AddMinutes(1), "RVR 07 TDZ 500 m < 550 m",
            new ConditionSnapshot(TestSnapshots.T0.AddMinutes(1), 500, "RVR07T", null, null, false, true, TestSnapshots.Thresholds));
        Live.Set(TestSnapshots.Make(1, pending: pending));
        var cut = RenderConsole();

        cut.Find("[data-testid=console-confirm]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "tower agrees (invented)");
        // the proposal is withdrawn while the dialog is open
        cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2)));
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Contains("was withdrawn while the reason was typed", cut.Markup, StringComparison.Ordinal));
        Assert.Empty(Commands.Calls);
        var snackbar = Assert.Single(Services.GetService<ISnackbar>()!.ShownSnackbars);
        Assert.Equal(Severity.Warning, snackbar.Severity);
        Assert.StartsWith("Confirm LVP preparation to LVP in force: refused — not sent: the proposal", snackbar.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void AppliedCommand_IsToldInASnackbar_NamingTheCommand()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, phase: Phase.Normal));
        Commands.NextOutcome = new CommandOutcome(CommandOutcomeKind.Applied, "preparation declared", 7);
        var cut = RenderConsole();

        cut.Find("[data-testid=console-declare-preparation]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        TypeReason(cut, "fog bank (invented)");
        cut.Find("[data-testid=reason-submit]").Click();

        cut.WaitForAssertion(() => Assert.Single(Services.GetService<ISnackbar>()!.ShownSnackbars));
        var snackbar = Services.GetService<ISnackbar>()!.ShownSnackbars.Single();
        Assert.Equal(Severity.Success, snackbar.Severity);
        Assert.Equal("Declare LVP preparation: done — preparation declared", snackbar.Message);
    }

    [Fact]
    public void WithoutAnEngineState_TheDialogSaysItCannotTellWhatTheCommandWouldDo()
    {
        SignIn(Dm, Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, phase: Phase.Active));
        var cut = RenderConsole();
        cut.Find("[data-testid=console-cancel]").Click();
        cut.WaitForElement("[data-testid=reason-dialog]");
        Assert.Equal("What this would do cannot be told now: the engine has no state yet.", cut.Find("[data-testid=reason-effect]").TextContent.Trim());
        Assert.Empty(cut.FindAll("[data-testid=reason-facts]"));
    }
}
