using Bunit;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Actions;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Actions;

/// <summary>
/// While the server is not recording, a tablet card offers no tick that looks as if it would be recorded: the button is
/// disabled, says so, and the card says why (docs/reliability.md "Storage faults"); recording again, the tick is back.
/// Items and times invented.
/// </summary>
public sealed class ActionCardNotRecordingTests : LiveComponentTest
{
    [Fact]
    public async Task WhileNotRecording_TheTickIsDisabledAndSaysWhy_AndComesBackWhenRecordingResumes()
    {
        SignIn("kim (invented)", Roles.GroundStaff, "airside");
        var items = new[] { TestSnapshots.Item("X1", "airside") };
        Live.Set(TestSnapshots.Make(1, items: items) with { Recording = new RecordingView(false, TestSnapshots.T0.AddMinutes(4), "disk full (invented)") });
        var cut = Render<TabletActions>();

        var tick = cut.Find("[data-testid=action-item][data-item-id=X1] [data-testid=action-tick]");
        Assert.True(tick.HasAttribute("disabled"));
        Assert.Contains("not recording", tick.TextContent, StringComparison.Ordinal);
        var note = cut.Find("[data-testid=action-item][data-item-id=X1] [data-testid=action-not-recording]").TextContent;
        Assert.StartsWith("NOT RECORDING since 03:04:00Z: a tick, undo or not-applicable cannot be recorded now", note.Trim(), StringComparison.Ordinal);

        await Live.PublishAsync(TestSnapshots.Make(2, items: items) with { Recording = RecordingView.Ok });

        cut.WaitForAssertion(() =>
        {
            var back = cut.Find("[data-testid=action-item][data-item-id=X1] [data-testid=action-tick]");
            Assert.False(back.HasAttribute("disabled"));
            Assert.Equal("Mark done", back.TextContent.Trim());
            Assert.Empty(cut.FindAll("[data-testid=action-not-recording]"));
        });
    }
}
