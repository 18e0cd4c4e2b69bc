using Bunit;
using OpsLvp.Core.Engine;
using static OpsLvp.Web.Tests.Components.Wall.WallSnapshots;

namespace OpsLvp.Web.Tests.Components.Wall;

/// <summary>
/// The wall's audible cue (issue "People" item 4): one chime per newly raised unacknowledged alarm, none when this
/// screen is muted, the mute choice stored for the "wall" screen. Alarms are invented.
/// </summary>
public sealed class WallAlarmCueTests : WallTestBase
{
    private static readonly Alarm Acked = new("feed-silent:rvr-07l-mid", AlarmKind.SensorSilent, "rvr-07l-mid silent for 4 min", At.AddMinutes(-4), "dm.ana", At.AddMinutes(-3));
    private static readonly Alarm Unknown = new("governing-rvr-unknown", AlarmKind.GoverningRvrUnknown, "governing RVR unknown", At.AddMinutes(-1));

    private BunitJSModuleInterop SoundModule(bool muted, bool browserAllowsSound = true)
    {
        var module = JSInterop.SetupModule("/assets/alarm-sound.js");
        module.Setup<bool>("isMuted", _ => true).SetResult(muted);
        module.Setup<bool>("watchSound", _ => true).SetResult(browserAllowsSound);
        module.Setup<bool>("soundAllowed", _ => true).SetResult(browserAllowsSound);
        module.Setup<bool>("chime", _ => true).SetResult(true);
        module.SetupVoid("setMuted", _ => true).SetVoidResult();
        return module;
    }

    private static Core.Engine.EngineStatus WithAlarms(params Alarm[] alarms) => Status(Phase.Active) with { Alarms = alarms };

    [Fact]
    public async Task NewUnacknowledgedAlarm_ChimesOnce()
    {
        var module = SoundModule(muted: false);
        var cut = RenderWall(Snapshot(WithAlarms(Acked), version: 1));
        cut.WaitForAssertion(() => Assert.Single(module.Invocations["isMuted"]));
        Assert.Equal("wall", module.Invocations["isMuted"][0].Arguments[0]);
        Assert.Empty(module.Invocations["chime"]);

        await cut.InvokeAsync(() => Live.PublishAsync(Snapshot(WithAlarms(Acked, Unknown), version: 2)));
        await cut.InvokeAsync(() => Live.PublishAsync(Snapshot(WithAlarms(Acked, Unknown), version: 3)));
        cut.WaitForAssertion(() => Assert.Equal("3", cut.Find("[data-testid=wall]").GetAttribute("data-version")));
        Assert.Single(module.Invocations["chime"]);
        Assert.Equal("Alarm sound on", cut.Find("[data-testid=alarm-mute]").TextContent.Trim());
    }

    [Fact]
    public async Task MutedWall_DoesNotChime()
    {
        var module = SoundModule(muted: true);
        var cut = RenderWall(Snapshot(WithAlarms(Acked), version: 1));
        cut.WaitForAssertion(() => Assert.Equal("Alarm sound off", cut.Find("[data-testid=alarm-mute]").TextContent.Trim()));

        await cut.InvokeAsync(() => Live.PublishAsync(Snapshot(WithAlarms(Acked, Unknown), version: 2)));
        cut.WaitForAssertion(() => Assert.Equal(2, cut.FindAll("[data-testid=wall-alarm]").Count));
        Assert.Empty(module.Invocations["chime"]);
    }

    [Fact]
    public async Task MuteToggle_StoresTheChoiceForTheWall_AndSilencesLaterAlarms()
    {
        var module = SoundModule(muted: false);
        var cut = RenderWall(Snapshot(WithAlarms(), version: 1));
        cut.WaitForAssertion(() => Assert.Single(module.Invocations["isMuted"]));

        cut.Find("[data-testid=alarm-mute]").Click();
        Assert.Equal(["wall", true], Assert.Single(module.Invocations["setMuted"]).Arguments);
        Assert.Equal("true", cut.Find("[data-testid=alarm-mute]").GetAttribute("aria-pressed"));

        await cut.InvokeAsync(() => Live.PublishAsync(Snapshot(WithAlarms(Unknown), version: 2)));
        cut.WaitForAssertion(() => Assert.Single(cut.FindAll("[data-testid=wall-alarm]")));
        Assert.Empty(module.Invocations["chime"]);
    }

    [Fact]
    public void WhenTheBrowserBlocksSound_TheToggleAsksForATap_AndNeverClaimsSoundOn()
    {
        var module = SoundModule(muted: false, browserAllowsSound: false);
        var cut = RenderWall(Snapshot(WithAlarms(Unknown), version: 1));
        cut.WaitForAssertion(() => Assert.Single(module.Invocations["watchSound"]));

        cut.WaitForAssertion(() => Assert.Equal("Tap to enable sound", cut.Find("[data-testid=alarm-mute]").TextContent.Trim()));
        Assert.Equal("false", cut.Find("[data-testid=alarm-mute]").GetAttribute("data-sound-allowed"));

        // The tap asks the browser again instead of muting.
        cut.Find("[data-testid=alarm-mute]").Click();
        Assert.Single(module.Invocations["soundAllowed"]);
        Assert.Empty(module.Invocations["setMuted"]);
    }

    [Fact]
    public async Task WhenTheBrowserStartsAllowingSound_TheToggleSaysSoundOn()
    {
        SoundModule(muted: false, browserAllowsSound: false);
        var cut = RenderWall(Snapshot(WithAlarms(Unknown), version: 1));
        cut.WaitForAssertion(() => Assert.Equal("Tap to enable sound", cut.Find("[data-testid=alarm-mute]").TextContent.Trim()));

        var cue = cut.FindComponent<OpsLvp.Web.Components.Shared.AlarmCue>();
        await cue.Instance.SoundStateChanged(true);

        cut.WaitForAssertion(() => Assert.Equal("Alarm sound on", cut.Find("[data-testid=alarm-mute]").TextContent.Trim()));
    }
}
