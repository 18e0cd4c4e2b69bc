using Bunit;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Shared;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Shared;

/// <summary>The alarm strip on every screen: listing, acknowledging (duty managers), and the wall's chime. Alarms are invented.</summary>
public sealed class AlarmStripTests : LiveComponentTest
{
    private static readonly Alarm Silent = new("sensor-silent:RVR07M", AlarmKind.SensorSilent, "sensor RVR07M silent past its maximum age", TestSnapshots.T0.AddMinutes(2));
    private static readonly Alarm Overdue = new("item-overdue:P1", AlarmKind.ItemOverdue, "item P1 (airside) overdue since 03:10", TestSnapshots.T0.AddMinutes(10));
    private static readonly Alarm AckedRvr = new("rvr-unknown", AlarmKind.GoverningRvrUnknown, "governing RVR unknown", TestSnapshots.T0.AddMinutes(1), "dana (invented)", TestSnapshots.T0.AddMinutes(3));

    private BunitJSModuleInterop SoundModule()
    {
        var module = JSInterop.SetupModule("/assets/alarm-sound.js");
        module.Setup<bool>("isMuted", _ => true).SetResult(false);
        module.Setup<bool>("watchSound", _ => true).SetResult(true);
        module.Setup<bool>("chime", _ => true).SetResult(true);
        module.SetupVoid("setMuted", _ => true).SetVoidResult();
        return module;
    }

    [Fact]
    public void ListsAlarms_UnacknowledgedFirst_WithWhoAcknowledged()
    {
        SignIn("kim (invented)", Roles.GroundStaff, "airside");
        Live.Set(TestSnapshots.Make(1, alarms: [AckedRvr, Overdue, Silent]));
        var cut = Render<AlarmStrip>();
        var rows = cut.FindAll("[data-testid=alarm]");
        Assert.Equal(["sensor-silent:RVR07M", "item-overdue:P1", "rvr-unknown"], rows.Select(r => r.GetAttribute("data-alarm-key")));
        Assert.Equal("ack dana (invented) 03:03Z", cut.Find("[data-testid=alarm-acked-by]").TextContent.Trim());
        Assert.Contains("has-unacked", cut.Find("[data-testid=alarm-strip]").ClassList);
    }

    [Fact]
    public void AFloodOfAlarms_IsCounted_AndListedInOneScrollableBox()
    {
        SignIn("kim (invented)", Roles.GroundStaff, "airside");
        var flood = Enumerable.Range(1, 12)
            .Select(i => new Alarm($"item-overdue:P{i}", AlarmKind.ItemOverdue, $"item P{i} (airside) overdue (invented)", TestSnapshots.T0.AddMinutes(i)))
            .Append(AckedRvr)
            .ToArray();
        Live.Set(TestSnapshots.Make(1, alarms: flood));
        var cut = Render<AlarmStrip>();

        Assert.Equal("13 alarms · 12 unacknowledged", cut.Find("[data-testid=alarm-count]").TextContent.Trim());
        Assert.Equal(13, cut.Find("[data-testid=alarm-list]").QuerySelectorAll("[data-testid=alarm]").Length);
    }

    [Fact]
    public void APendingTransitionAlarm_IsWordedFromTheVocabulary_WithoutAnAsciiArrow()
    {
        SignIn("kim (invented)", Roles.GroundStaff, "airside");
        var pending = new PendingTransition(Phase.Preparation, Phase.Active, TestSnapshots.T0.AddMinutes(1), "RVR 07 TDZ 500 m < 550 m",
            new ConditionSnapshot(TestSnapshots.T0.AddMinutes(1), 500, "RVR07T", null, null, false, true, TestSnapshots.Thresholds));
        var alarm = new Alarm("pending", AlarmKind.PendingTransition, "confirm preparation -> active: RVR 07 TDZ 500 m < 550 m", TestSnapshots.T0.AddMinutes(1));
        Live.Set(TestSnapshots.Make(1, alarms: [alarm], pending: pending));
        var cut = Render<AlarmStrip>();

        var text = cut.Find("[data-testid=alarm] .alarm-message").TextContent;
        Assert.Equal("confirm LVP preparation to LVP in force: RVR 07 TDZ 500 m < 550 m", text);
        Assert.DoesNotContain("->", cut.Markup, StringComparison.Ordinal);
    }

    [Fact]
    public void NoAlarms_SaysSo()
    {
        SignIn("lee (invented)", Roles.Viewer);
        Live.Set(TestSnapshots.Make(1));
        var cut = Render<AlarmStrip>();
        Assert.Equal("No alarms", cut.Find("[data-testid=alarm-none]").TextContent);
    }

    [Fact]
    public void DutyManager_GetsAnAcknowledgeButton_ThatSendsAcknowledgeAlarm()
    {
        SignIn("dana (invented)", Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, alarms: [Silent, AckedRvr]));
        var cut = Render<AlarmStrip>();
        var button = Assert.Single(cut.FindAll("[data-testid=alarm-ack]"));
        button.Click();
        var (caller, command) = Assert.Single(Commands.Calls);
        Assert.Equal("dana (invented)", caller.Name);
        Assert.Equal(new AcknowledgeAlarm("dana (invented)", "sensor-silent:RVR07M"), command);
    }

    [Theory]
    [InlineData(Roles.GroundStaff)]
    [InlineData(Roles.Viewer)]
    public void OthersSeeAlarms_ButNoAcknowledgeButton(string role)
    {
        SignIn("kim (invented)", role, "airside");
        Live.Set(TestSnapshots.Make(1, alarms: [Silent]));
        var cut = Render<AlarmStrip>();
        Assert.Single(cut.FindAll("[data-testid=alarm]"));
        Assert.Empty(cut.FindAll("[data-testid=alarm-ack]"));
    }

    [Fact]
    public async Task FollowsLiveSnapshots()
    {
        SignIn("lee (invented)", Roles.Viewer);
        Live.Set(TestSnapshots.Make(1));
        var cut = Render<AlarmStrip>();
        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, alarms: [Overdue])));
        cut.WaitForAssertion(() => Assert.Equal("item-overdue:P1", cut.Find("[data-testid=alarm]").GetAttribute("data-alarm-key")));
    }

    [Fact]
    public async Task Audible_ChimesOncePerNewUnacknowledgedAlarm_NotForAcknowledgedOrRepeats()
    {
        SignIn("lee (invented)", Roles.Viewer);
        var module = SoundModule();
        Live.Set(TestSnapshots.Make(1, alarms: [AckedRvr]));
        var cut = Render<AlarmStrip>(p => p.Add(s => s.Audible, true).Add(s => s.ScreenKey, "wall"));
        cut.WaitForAssertion(() => Assert.Single(module.Invocations["isMuted"]));
        Assert.Empty(module.Invocations["chime"]);

        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, alarms: [AckedRvr, Silent])));
        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(3, alarms: [AckedRvr, Silent])));
        cut.WaitForAssertion(() => Assert.Single(module.Invocations["chime"]));

        // re-raised later under the same key: a new alarm
        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(4, alarms: [Silent with { RaisedAt = Silent.RaisedAt.AddMinutes(5) }])));
        cut.WaitForAssertion(() => Assert.Equal(2, module.Invocations["chime"].Count));
        Assert.Equal("wall", module.Invocations["isMuted"][0].Arguments[0]);
    }

    [Fact]
    public async Task Muted_DoesNotChime_AndTheChoiceIsStoredForThisScreen()
    {
        SignIn("lee (invented)", Roles.Viewer);
        var module = SoundModule();
        Live.Set(TestSnapshots.Make(1));
        var cut = Render<AlarmStrip>(p => p.Add(s => s.Audible, true).Add(s => s.ScreenKey, "wall"));
        cut.WaitForAssertion(() => Assert.Single(module.Invocations["isMuted"]));

        cut.Find("[data-testid=alarm-mute]").Click();
        var stored = Assert.Single(module.Invocations["setMuted"]);
        Assert.Equal(["wall", true], stored.Arguments);
        Assert.Equal("Sound off", cut.Find("[data-testid=alarm-mute]").TextContent.Trim());

        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, alarms: [Silent])));
        cut.WaitForAssertion(() => Assert.Single(cut.FindAll("[data-testid=alarm]")));
        Assert.Empty(module.Invocations["chime"]);
    }

    [Fact]
    public void NotAudible_LoadsNoSoundModule()
    {
        SignIn("lee (invented)", Roles.Viewer);
        Live.Set(TestSnapshots.Make(1, alarms: [Silent]));
        var cut = Render<AlarmStrip>();
        Assert.Empty(cut.FindAll("[data-testid=alarm-mute]"));
        Assert.Empty(JSInterop.Invocations["import"]);
    }

    [Fact]
    public async Task SignedOut_ShowsNoStripAndNoAlarms_EvenWhenAlarmsArrive()
    {
        // The layout is shared with /signin, /, /setup, /signout and the error pages (issue 12).
        SignedOut();
        Live.Set(TestSnapshots.Make(1, alarms: [Silent]));
        var cut = Render<AlarmStrip>();
        await cut.InvokeAsync(() => Live.PublishAsync(TestSnapshots.Make(2, alarms: [Silent, Overdue])));

        Assert.Empty(cut.FindAll("[data-testid=alarm-strip]"));
        Assert.DoesNotContain("RVR07M", cut.Markup, StringComparison.Ordinal);
    }

    [Fact]
    public void DisplayLink_SeesTheAlarms()
    {
        var auth = AddAuthorization();
        auth.SetAuthorized("display:ops-room (invented)");
        auth.SetClaims(new System.Security.Claims.Claim(Web.Access.AccessClaims.DisplayToken, "t1"));
        Live.Set(TestSnapshots.Make(1, alarms: [Silent]));

        var cut = Render<AlarmStrip>();

        Assert.Single(cut.FindAll("[data-testid=alarm]"));
    }
}
