using Bunit;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Actions;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Actions;

/// <summary>The tablet page: who sees what, tap → confirm → sending → done only from the server's snapshot. People and items are invented.</summary>
public sealed class TabletActionsTests : LiveComponentTest
{
    private const string Kim = "kim (invented)";

    private static ItemTick TickBy(string user, int minute, string? note = null) => new(user, "airside", TestSnapshots.T0.AddMinutes(minute), note);

    [Fact]
    public void NotSignedIn_ShowsASignInMessage_AndNoActions()
    {
        SignedOut();
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside")]));
        var cut = Render<TabletActions>();
        Assert.Contains("not signed in", cut.Find("[data-testid=actions-signed-out]").TextContent);
        Assert.Empty(cut.FindAll("[data-testid=action-item]"));
    }

    [Fact]
    public void SignedInWithoutATeam_SaysSo_AndShowsNoActions()
    {
        SignIn("viv (invented)", Roles.GroundStaff);
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside")]));
        var cut = Render<TabletActions>();
        Assert.Contains("belongs to no team", cut.Find("[data-testid=actions-no-team]").TextContent);
        Assert.Empty(cut.FindAll("[data-testid=action-item]"));
    }

    [Fact]
    public void NoEpisodeRunning_SaysThereIsNothingToDo()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, phase: Phase.Normal));
        var cut = Render<TabletActions>();
        Assert.Contains("No LVP episode is running", cut.Find("[data-testid=actions-no-episode]").TextContent);
    }

    [Fact]
    public void ShowsOnlyTheCallersTeamItems_OverdueFirstAndMarkedOverdue()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, items:
        [
            TestSnapshots.Item("P1", "airside", dueMinutes: 10),
            TestSnapshots.Item("P2", "lighting", dueMinutes: 2, overdue: true),
            TestSnapshots.Item("P3", "airside", dueMinutes: 3, overdue: true),
        ]));
        var cut = Render<TabletActions>();
        var cards = cut.FindAll("[data-testid=action-item]");
        Assert.Equal(["P3", "P1"], cards.Select(c => c.GetAttribute("data-item-id")));
        Assert.Contains("overdue", cards[0].ClassList);
        Assert.Contains("OVERDUE by 2 min —", cards[0].QuerySelector("[data-testid=action-due]")!.TextContent);
        Assert.Equal("Airside Ops (invented) · 2 open · 1 overdue · 0 done", Normalise(cut.Find("[data-testid=actions-summary]").TextContent));
    }

    [Fact]
    public async Task Tick_AsksConfirmation_ShowsSendingUntilOutcome_AndDoneOnlyAfterTheNextSnapshot()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside")]));
        Commands.Hold = true;
        var cut = Render<TabletActions>();

        cut.Find("[data-testid=action-tick]").Click();
        Assert.Empty(Commands.Calls);
        cut.Find("[data-testid=action-confirm] input").Input("works stopped at stand 4");
        cut.Find("[data-testid=action-confirm-yes]").Click();

        var (caller, command) = Assert.Single(Commands.Calls);
        Assert.Equal(Kim, caller.Name);
        Assert.Equal(new TickItem(Kim, "airside", "P1", "works stopped at stand 4"), command);
        Assert.Equal("sending", cut.Find("[data-testid=action-item]").GetAttribute("data-status"));
        Assert.NotNull(cut.Find("[data-testid=action-sending]"));

        Commands.Release(new CommandOutcome(CommandOutcomeKind.Applied, "ticked", 7));
        cut.WaitForAssertion(() => Assert.Empty(cut.FindAll("[data-testid=action-message]")));
        // committed but not yet in a snapshot: still not shown as done
        Assert.Equal("sending", cut.Find("[data-testid=action-item]").GetAttribute("data-status"));
        Assert.Empty(cut.FindAll("[data-testid=action-done-by]"));

        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, items: [TestSnapshots.Item("P1", "airside", ItemStatus.Done, tick: TickBy(Kim, 4, "works stopped at stand 4"))])));
        cut.WaitForAssertion(() => Assert.Equal("done", cut.Find("[data-testid=action-item]").GetAttribute("data-status")));
        Assert.Equal("Done by kim (invented) at 03:04:00Z — “works stopped at stand 4”", Normalise(cut.Find("[data-testid=action-done-by]").TextContent));
        Assert.Empty(cut.FindAll("[data-testid=action-sending]"));
    }

    [Fact]
    public async Task AnotherTabletTickedFirst_TellsWhoAndWhen_AndShowsTheirTickFromTheSnapshot()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside")]));
        Commands.NextOutcome = new CommandOutcome(CommandOutcomeKind.Refused, "Item P1 already done by lee (invented) at 03:03 UTC");
        var cut = Render<TabletActions>();

        cut.Find("[data-testid=action-tick]").Click();
        cut.Find("[data-testid=action-confirm-yes]").Click();

        Assert.Equal("Item P1 already done by lee (invented) at 03:03 UTC", cut.Find("[data-testid=action-message]").TextContent.Trim());
        Assert.Equal("open", cut.Find("[data-testid=action-item]").GetAttribute("data-status"));

        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, items: [TestSnapshots.Item("P1", "airside", ItemStatus.Done, tick: TickBy("lee (invented)", 3))])));
        cut.WaitForAssertion(() => Assert.Contains("Done by lee (invented) at 03:03:00Z", cut.Find("[data-testid=action-done-by]").TextContent));
    }

    [Fact]
    public async Task AnotherTabletTicksWhileThisOneAsks_TheQuestionCloses_AndSaysWhoDidIt()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside")]));
        var cut = Render<TabletActions>();
        cut.Find("[data-testid=action-tick]").Click();
        Assert.NotNull(cut.Find("[data-testid=action-confirm]"));

        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, items: [TestSnapshots.Item("P1", "airside", ItemStatus.Done, tick: TickBy("lee (invented)", 3))])));

        cut.WaitForAssertion(() => Assert.Empty(cut.FindAll("[data-testid=action-confirm]")));
        Assert.Equal("Already done by lee (invented) at 03:03:00Z", cut.Find("[data-testid=action-message]").TextContent.Trim());
        Assert.Empty(Commands.Calls);
    }

    [Fact]
    public void ConfirmBack_SendsNothing()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside")]));
        var cut = Render<TabletActions>();
        cut.Find("[data-testid=action-tick]").Click();
        cut.Find("[data-testid=action-confirm-back]").Click();
        Assert.Empty(Commands.Calls);
        Assert.NotNull(cut.Find("[data-testid=action-tick]"));
    }

    [Fact]
    public void Undo_NeedsAReasonBeforeItCanBeSent()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside", ItemStatus.Done, tick: TickBy(Kim, 4))]));
        var cut = Render<TabletActions>();

        cut.Find("[data-testid=action-undo]").Click();
        Assert.True(cut.Find("[data-testid=action-undo-confirm]").HasAttribute("disabled"));
        cut.Find("[data-testid=action-undo-form] input").Input("   ");
        Assert.True(cut.Find("[data-testid=action-undo-confirm]").HasAttribute("disabled"));
        cut.Find("[data-testid=action-undo-form] input").Input("ticked the wrong item");
        cut.Find("[data-testid=action-undo-confirm]").Click();

        Assert.Equal(new UntickItem(Kim, "P1", "ticked the wrong item"), Assert.Single(Commands.Calls).Command);
    }

    [Fact]
    public void FailedCommand_IsShownAsAnError_AndTheItemStaysOpen()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside")]));
        Commands.NextOutcome = new CommandOutcome(CommandOutcomeKind.Failed, "audit storage failing: not recorded");
        var cut = Render<TabletActions>();
        cut.Find("[data-testid=action-tick]").Click();
        cut.Find("[data-testid=action-confirm-yes]").Click();
        Assert.Contains("audit storage failing", cut.Find("[data-testid=action-message]").TextContent);
        Assert.Equal("open", cut.Find("[data-testid=action-item]").GetAttribute("data-status"));
    }

    [Fact]
    public void TargetsAreFingerSized()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, items: [TestSnapshots.Item("P1", "airside")]));
        var cut = Render<TabletActions>();
        // the 72 px minimum height lives in ActionItemCard.razor.css on .action-big (WCAG 2.5.5 asks ≥ 44 px; common practice ≥ 48 px)
        Assert.Contains("action-big", cut.Find("[data-testid=action-tick]").ClassList);
    }

    [Fact]
    public void UnsubscribesWhenDisposed()
    {
        SignIn(Kim, Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1));
        var cut = Render<TabletActions>();
        Assert.Equal(1, Live.SubscriberCount);
        cut.Instance.Dispose();
        Assert.Equal(0, Live.SubscriberCount);
    }

    private static string Normalise(string text) => string.Join(' ', text.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries));
}
