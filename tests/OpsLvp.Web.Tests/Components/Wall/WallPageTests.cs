using Bunit;
using AngleSharp.Dom;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Live;
using static OpsLvp.Web.Tests.Components.Wall.WallSnapshots;

namespace OpsLvp.Web.Tests.Components.Wall;

/// <summary>The /wall page rendered by bUnit from invented snapshots.</summary>
public sealed class WallPageTests : WallTestBase
{
    [Theory]
    [InlineData(Phase.Normal, "NORMAL OPERATIONS", "○", "wall-phase-normal")]
    [InlineData(Phase.Preparation, "LVP PREPARATION", "△", "wall-phase-preparation")]
    [InlineData(Phase.Active, "LVP IN FORCE", "■", "wall-phase-active")]
    [InlineData(Phase.Cancellation, "CANCELLING LVP", "▽", "wall-phase-cancellation")]
    public void EachPhase_ShowsItsOwnText_GlyphAndPattern(Phase phase, string title, string glyph, string css)
    {
        var cut = RenderWall(Snapshot(Status(phase)));

        var band = cut.Find("[data-testid=wall-phase]");
        Assert.Equal(title, cut.Find("[data-testid=wall-phase-title]").TextContent);
        Assert.Equal(glyph, band.QuerySelector(".wall-phase-glyph")!.TextContent);
        Assert.Contains(css, band.ClassList);
        // Phase since 72 minutes before the snapshot (invented).
        Assert.Equal("since 20:48Z · 1 h 12 min", cut.Find("[data-testid=wall-phase-since]").TextContent);
    }

    [Fact]
    public void PreparationHeldForSafeguards_IsNotCalledInForce_AndHasItsOwnLook()
    {
        // docs/engine.md R13
        var cut = RenderWall(Snapshot(Status(Phase.Preparation) with { SafeguardsComplete = false, ConditionsMetSafeguardsIncomplete = true }));

        Assert.Equal("LVP CONDITIONS MET — SAFEGUARDS INCOMPLETE", cut.Find("[data-testid=wall-phase-title]").TextContent);
        Assert.Contains("wall-phase-warning", cut.Find("[data-testid=wall-phase]").ClassList);
    }

    [Fact]
    public void Episode_IsShownOutsideNormal()
    {
        var cut = RenderWall(Snapshot(Status(Phase.Active)));

        Assert.Equal("Episode XDMO-20261201T2036Z · deepest: LVP in force", cut.Find("[data-testid=wall-episode]").TextContent);
    }

    [Fact]
    public void StaleAndOutOfServicePositions_AreMarkedInWords_AndLowestFreshIsTagged()
    {
        var runway = Runway07L(
            new PositionRvr(RvrPosition.Tdz, "rvr-07l-tdz", Rvr(450, "rvr-07l-tdz", "07L TDZ", ageSeconds: 300, stale: true), false, true),
            Fresh(RvrPosition.Mid, "rvr-07l-mid", "07L MID", 600),
            new PositionRvr(RvrPosition.End, "rvr-07l-end", Rvr(300, "rvr-07l-end", "07L END"), true, true));

        var other = new RunwayRvrStatus("07R/25L", "07R", [Fresh(RvrPosition.Tdz, "rvr-07r-tdz", "07R TDZ", 900)]);

        var cut = RenderWall(Snapshot(Status(Phase.Active, [runway, other]), outOfService: ["rvr-07l-end"]));

        var tiles = cut.FindAll("[data-testid=wall-pos]");
        Assert.Equal(["TDZ", "MID", "END", "TDZ"], tiles.Select(t => t.GetAttribute("data-position")));
        Assert.Equal("STALE · 5 min", State(tiles[0]));
        Assert.Contains("wall-pos-stale", tiles[0].ClassList);
        Assert.Equal("OUT OF SERVICE", State(tiles[2]));
        Assert.Contains("wall-pos-oos", tiles[2].ClassList);
        // The stale 450 m and the out-of-service 300 m do not count: 07L MID 600 m is the lowest usable value.
        var lowest = Assert.Single(cut.FindAll("[data-testid=wall-lowest]"));
        Assert.Same(tiles[1], lowest.Closest("[data-testid=wall-pos]"));
        Assert.Equal("No fresh reading: RWY 07L TDZ", cut.Find("[data-testid=wall-sensors]").TextContent.TrimStart('✕', ' '));
        Assert.Equal("⊘ Out of service: rvr-07l-end", cut.Find("[data-testid=wall-oos]").TextContent);
    }

    [Fact]
    public void Trend_ShowsOneMinuteMeanAndArrow()
    {
        var cut = RenderWall(Snapshot(trends: [new SensorTrend("rvr-07l-tdz", 712.4, "D")]));

        var tdz = cut.FindAll("[data-testid=wall-pos]")[0];
        Assert.Equal("1-min 712 m", tdz.QuerySelector(".wall-pos-mean")!.TextContent);
        Assert.Equal("↓", tdz.QuerySelector(".wall-pos-trend")!.TextContent);
        Assert.Equal("falling", tdz.QuerySelector(".wall-pos-trend")!.GetAttribute("title"));
    }

    [Fact]
    public void OverdueItems_AreMarkedLate_AndTheirTeamComesFirst()
    {
        var items = new[]
        {
            Item("p1", "Check stop bars", "Field lighting", At.AddMinutes(10), overdue: false),
            Item("p2", "Stop airside works", "Airside desk", At.AddMinutes(-7), overdue: true),
            Item("p3", "Brief the fire watch", "Airside desk", At.AddMinutes(5), overdue: false),
            Item("p4", "Recall vehicles", "Field lighting", At.AddMinutes(-1), overdue: false, status: ItemStatus.Done),
        };

        var cut = RenderWall(Snapshot(Status(Phase.Preparation), items: items));

        var teams = cut.FindAll("[data-testid=wall-team]");
        Assert.Equal(2, teams.Count);
        Assert.StartsWith("Airside desk", teams[0].TextContent.Trim(), StringComparison.Ordinal);
        Assert.Contains("wall-team-late", teams[0].ClassList);
        Assert.Contains("2 open · 1 late", teams[0].TextContent, StringComparison.Ordinal);
        var late = cut.Find("[data-item=p2]");
        Assert.Contains("wall-item-late", late.ClassList);
        Assert.Equal("LATE 7 min", late.QuerySelector(".wall-item-due")!.TextContent);
        Assert.Equal("due 22:05Z", cut.Find("[data-item=p3] .wall-item-due").TextContent);
        Assert.Empty(cut.FindAll("[data-item=p4]"));
        Assert.Equal("1 of 4 done · 1 late", cut.Find("[data-testid=wall-items-summary]").TextContent);
    }

    [Fact]
    public void Alarms_AreListed_UnacknowledgedFirst()
    {
        var status = Status(Phase.Active) with
        {
            Alarms =
            [
                new Alarm("feed-silent:rvr-07l-mid", AlarmKind.SensorSilent, "rvr-07l-mid silent for 4 min", At.AddMinutes(-4), "dm.ana", At.AddMinutes(-3)),
                new Alarm("governing-rvr-unknown", AlarmKind.GoverningRvrUnknown, "governing RVR unknown", At.AddMinutes(-1)),
            ],
        };

        var cut = RenderWall(Snapshot(status));

        var alarms = cut.FindAll("[data-testid=wall-alarm]");
        Assert.Equal(["governing-rvr-unknown", "feed-silent:rvr-07l-mid"], alarms.Select(a => a.GetAttribute("data-key")));
        Assert.Contains("wall-alarm-raised", alarms[0].ClassList);
        Assert.Contains("wall-alarm-acked", alarms[1].ClassList);
        Assert.Contains("since 21:56Z · acknowledged", alarms[1].TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public void RecoveryDwell_ShowsItsTextAndProgress()
    {
        var status = Status(Phase.Active) with
        {
            Waiting = [new WaitingFor(WaitKind.RecoveryDwell, "recovery from active held 6 of 10 min", 360, 600, [])],
        };

        var cut = RenderWall(Snapshot(status));

        var wait = cut.Find("[data-testid=wall-wait]");
        Assert.Equal("recovery from active held 6 of 10 min", wait.QuerySelector(".wall-wait-text")!.TextContent);
        Assert.Equal("60", cut.Find("[data-testid=wall-wait-bar]").GetAttribute("aria-valuenow"));
        Assert.Contains("width: 60%", cut.Find(".wall-bar-fill").GetAttribute("style"), StringComparison.Ordinal);
    }

    [Fact]
    public void PendingConfirmation_Hold_AndForecast_AreStandingNotices()
    {
        var status = Status(Phase.Preparation) with
        {
            DeteriorationForecast = true,
            Hold = new Hold(Phase.Preparation, "dm.ana", "fog bank offshore (invented)", At.AddMinutes(-20)),
            Pending = new PendingTransition(Phase.Preparation, Phase.Active, At.AddMinutes(-2), "RVR 07L TDZ 500 m < 550 m", null!),
            Waiting = [new WaitingFor(WaitKind.Confirmation, "waiting for confirmation: preparation -> active", null, null, [])],
        };

        var cut = RenderWall(Snapshot(status));

        var notices = cut.FindAll("[data-testid=wall-notice]");
        // The forecast flag is the forecast line's (with its source), not a notice as well.
        Assert.Equal(["AWAITING CONFIRMATION", "HOLD"], notices.Select(n => n.QuerySelector(".wall-notice-label")!.TextContent));
        Assert.Equal("true", cut.Find("[data-testid=forecast-line]").GetAttribute("data-on"));
        Assert.Equal("LVP preparation to LVP in force, proposed 21:58Z: RVR 07L TDZ 500 m < 550 m", notices[0].QuerySelector(".wall-notice-text")!.TextContent);
        // The confirmation wait is the notice; it is not repeated under "waiting for".
        Assert.Empty(cut.FindAll("[data-testid=wall-wait]"));
    }

    [Fact]
    public void WithoutSnapshot_ShowsNoDataState_ThenTheWallWhenOneArrives()
    {
        var cut = RenderWall(null);

        Assert.NotNull(cut.Find("[data-testid=wall-nodata]"));
        Assert.Empty(cut.FindAll("[data-testid=wall-phase]"));

        cut.InvokeAsync(() => Live.PublishAsync(Snapshot(Status(Phase.Preparation))));

        cut.WaitForAssertion(() => Assert.Equal("LVP PREPARATION", cut.Find("[data-testid=wall-phase-title]").TextContent));
        Assert.Empty(cut.FindAll("[data-testid=wall-nodata]"));
    }

    [Fact]
    public void NewSnapshot_ReRendersWithoutReload_AndAnOlderVersionIsIgnored()
    {
        var cut = RenderWall(Snapshot(Status(Phase.Normal), version: 5));
        Assert.Equal(1, Live.SubscriberCount);

        cut.InvokeAsync(() => Live.PublishAsync(Snapshot(Status(Phase.Active), version: 6)));
        cut.WaitForAssertion(() => Assert.Equal("LVP IN FORCE", cut.Find("[data-testid=wall-phase-title]").TextContent));

        cut.InvokeAsync(() => Live.PublishAsync(Snapshot(Status(Phase.Normal), version: 4)));
        Assert.Equal("LVP IN FORCE", cut.Find("[data-testid=wall-phase-title]").TextContent);
        Assert.Equal("6", cut.Find("[data-testid=wall]").GetAttribute("data-version"));
    }

    [Fact]
    public void TimeInPhase_KeepsCountingOnTheClock()
    {
        var cut = RenderWall(Snapshot(Status(Phase.Active)));

        Clock.Advance(TimeSpan.FromMinutes(3));

        cut.WaitForAssertion(() => Assert.Equal("since 20:48Z · 1 h 15 min", cut.Find("[data-testid=wall-phase-since]").TextContent));
        Assert.Equal("22:03:00Z", cut.Find("[data-testid=wall-utc]").TextContent);
    }

    [Fact]
    public async Task Disposing_TheWall_Unsubscribes()
    {
        RenderWall(Snapshot());
        Assert.Equal(1, Live.SubscriberCount);

        await DisposeComponentsAsync();

        Assert.Equal(0, Live.SubscriberCount);
    }

    [Fact]
    public void IllustrativeMarker_AndDemoBadge_AreShown()
    {
        var cut = RenderWall(Snapshot(demo: new DemoView(30)));

        Assert.Equal("ILLUSTRATIVE VALUES", cut.Find("[data-testid=wall-illustrative]").TextContent);
        Assert.Equal("DEMO ×30", cut.Find("[data-testid=demo-badge]").TextContent);
    }

    [Fact]
    public void Feeds_ShowStatusInWords()
    {
        var cut = RenderWall(Snapshot(feeds: [Feed("station-a", "ok"), Feed("metar", "down", "no answer for 5 min")]));

        var feeds = cut.FindAll("[data-testid=wall-feed]");
        Assert.Equal("OK", feeds[0].QuerySelector(".wall-feed-status")!.TextContent);
        Assert.Equal("DOWN", feeds[1].QuerySelector(".wall-feed-status")!.TextContent);
        Assert.Equal("no answer for 5 min", feeds[1].QuerySelector(".wall-feed-detail")!.TextContent);
    }

    private static string State(IElement tile) => tile.QuerySelector("[data-testid=wall-pos-state]")!.TextContent;
}
