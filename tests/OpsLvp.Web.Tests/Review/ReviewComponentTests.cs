using Bunit;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using MudBlazor.Services;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Review;
using OpsLvp.Web.Components.Pages;
using OpsLvp.Web.Components.Review;
using OpsLvp.Web.Review;

namespace OpsLvp.Web.Tests.Review;

/// <summary>bUnit tests of the review components. Every figure is invented (XDMO "Demo Field (invented)").</summary>
public sealed class ReviewComponentTests : BunitContext, IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 1, 15, 20, 0, 0, TimeSpan.Zero);

    public ReviewComponentTests()
    {
        Services.AddMudServices();
        JSInterop.Mode = JSRuntimeMode.Loose;
    }

    public Task InitializeAsync() => Task.CompletedTask;

    // MudBlazor registers services that only dispose asynchronously.
    Task IAsyncLifetime.DisposeAsync() => DisposeAsync().AsTask();

    private static EpisodeSummary Summary(DateTimeOffset? end) => new(
        "XDMO-20260115T2036Z", T0.AddMinutes(36), end, Phase.Active, 175, "rvr-07l-mid", 100, "ceil-1", 3,
        [
            new TransitionMark(T0.AddMinutes(36), Phase.Normal, Phase.Preparation, "auto", null, "RVR < 1000 m (invented)", null),
            new TransitionMark(T0.AddMinutes(101), Phase.Preparation, Phase.Active, "auto", null, "RVR < 550 m (invented)", null),
        ],
        1, 2, 9,
        [new PhaseSpan(Phase.Preparation, T0.AddMinutes(36), T0.AddMinutes(101)), new PhaseSpan(Phase.Active, T0.AddMinutes(101), T0.AddMinutes(282))]);

    [Fact]
    public void AuditTable_FoldsALongPayload_AndShowsAShortOneWhole()
    {
        var profile = OpsLvp.Core.Profile.ProfileLoader.Load(new OpsLvp.Web.Hosting.ContentPaths(AppContext.BaseDirectory).Resolve("seed-demo/profile.json"));
        var recorded = OpsLvp.Web.Engine.ProfileRecord.Entry(profile, T0);
        var first = OpsLvp.Core.Audit.AuditChain.Append(null, T0, "engine", "engine_started", "{\"profile\":\"invented\"}");
        var second = OpsLvp.Core.Audit.AuditChain.Append(first, recorded.Time, recorded.Actor, recorded.Kind, recorded.PayloadJson);
        Assert.True(second.PayloadJson.Length > AuditEntryTable.LongPayload);

        var cut = Render<AuditEntryTable>(p => p.Add(c => c.Entries, [first, second]).Add(c => c.Segment, OpsLvp.Core.Audit.AuditChain.Verify([first, second])));

        var rows = cut.FindAll("[data-testid=audit-row]");
        Assert.Equal(2, rows.Count);
        Assert.Empty(rows[0].QuerySelectorAll("[data-testid=audit-payload-long]"));
        Assert.Contains("{\"profile\":\"invented\"}", rows[0].TextContent, StringComparison.Ordinal);
        var folded = Assert.Single(rows[1].QuerySelectorAll("[data-testid=audit-payload-long]"));
        Assert.Contains($"({second.PayloadJson.Length} characters; show all)", folded.QuerySelector("summary")!.TextContent, StringComparison.Ordinal);
        Assert.Contains(second.PayloadJson, folded.TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public void Summary_ShowsTimesPhaseLowestValuesCountsAndTimeInForce()
    {
        var cut = Render<EpisodeSummaryCard>(p => p.Add(c => c.Summary, Summary(T0.AddMinutes(300))).Add(c => c.Verifies, true));

        Assert.Equal("2026-01-15 20:36:00Z", cut.Find("[data-testid=summary-start]").TextContent);
        Assert.Equal("2026-01-16 01:00:00Z", cut.Find("[data-testid=summary-end]").TextContent);
        Assert.Equal("LVP in force", cut.Find("[data-testid=summary-deepest]").TextContent);
        Assert.Equal("175 m (rvr-07l-mid)", cut.Find("[data-testid=summary-rvr]").TextContent);
        Assert.Equal("100 ft (ceil-1)", cut.Find("[data-testid=summary-ceiling]").TextContent);
        // Active 21:41 → 00:42 = 181 min.
        Assert.Equal("3 h 01 min", cut.Find("[data-testid=summary-active]").TextContent);
        Assert.Equal("2 / 1", cut.Find("[data-testid=summary-transitions]").TextContent.Trim());
        Assert.Equal("3", cut.Find("[data-testid=summary-alarms]").TextContent);
        Assert.Contains("chain verifies", cut.Find("[data-testid=summary-integrity]").TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public void Summary_RunningAndBrokenChain_SaysSo()
    {
        var cut = Render<EpisodeSummaryCard>(p => p.Add(c => c.Summary, Summary(null)).Add(c => c.Verifies, false).Add(c => c.IntegrityDetail, "entry 7: stored hash differs"));

        Assert.Equal("still running", cut.Find("[data-testid=summary-end]").TextContent);
        Assert.Contains("does NOT verify", cut.Find("[data-testid=summary-integrity]").TextContent, StringComparison.Ordinal);
        Assert.Contains("entry 7", cut.Find("[data-testid=summary-integrity]").TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public void PerformanceTable_MarksLateItems_AndShowsIntervals()
    {
        var perf = new ChecklistPerformance(
            [
                new ItemPerformance("prep-rvr-check", Phase.Preparation, "airside-ops", true, T0, T0.AddMinutes(10), T0.AddMinutes(4), "k.marlow", "airside-ops", false, "done"),
                new ItemPerformance("prep-fire-brief", Phase.Preparation, "rescue-fire", true, T0, T0.AddMinutes(15), T0.AddMinutes(29), "j.lindqvist", "rescue-fire", true, "done"),
                new ItemPerformance("prep-note", Phase.Preparation, "tower-link", false, T0, T0.AddMinutes(15), null, null, null, true, "voided"),
            ],
            T0,
            T0.AddMinutes(29),
            [new ConfirmationDelay(Phase.Preparation, Phase.Active, T0.AddMinutes(40), T0.AddMinutes(43), "dm.invented", "confirmed")],
            new Dictionary<Phase, TimeSpan> { [Phase.Normal] = TimeSpan.Zero, [Phase.Preparation] = TimeSpan.FromMinutes(43), [Phase.Active] = TimeSpan.FromMinutes(90) });

        var cut = Render<ChecklistPerformanceTable>(p => p.Add(c => c.Performance, perf));

        var rows = cut.FindAll("[data-testid=perf-row]");
        Assert.Equal(3, rows.Count);
        Assert.Equal(["on time", "late", "late"], cut.FindAll("[data-testid=perf-late]").Select(e => e.TextContent));
        Assert.Contains("review-late", rows[1].ClassName, StringComparison.Ordinal);
        Assert.Contains("29 min", rows[1].TextContent, StringComparison.Ordinal);
        Assert.Contains("(optional)", rows[2].TextContent, StringComparison.Ordinal);
        Assert.StartsWith("29 min (20:00:00Z → 20:29:00Z)", cut.Find("[data-testid=perf-safeguards]").TextContent, StringComparison.Ordinal);
        Assert.Contains("3 min", cut.Find("[data-testid=perf-confirmation]").TextContent, StringComparison.Ordinal);
        Assert.Equal(["preparation", "active"], cut.FindAll("[data-testid=perf-phase]").Select(e => e.GetAttribute("data-phase")));
    }

    [Fact]
    public void EpisodePage_OnTheDemoNight_RendersSummaryChartPerformanceAndAudit()
    {
        Services.AddSingleton<TimeProvider>(new FakeTimeProvider(new DateTimeOffset(2026, 1, 16, 6, 0, 0, TimeSpan.Zero)));
        Services.AddSingleton<IEpisodeSource>(new DemoNightSource());
        Services.AddSingleton<ReviewService>();
        var id = EpisodeModel.Build(DemoNightSource.Record.Events, DemoNightSource.Record.Readings, DateTimeOffset.MaxValue)[0].Id;

        var cut = Render<ReviewEpisode>(p => p.Add(c => c.EpisodeId, id));

        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=episode-summary]")));
        Assert.Equal("LVP in force", cut.Find("[data-testid=summary-deepest]").TextContent);
        Assert.Contains("chain verifies", cut.Find("[data-testid=summary-integrity]").TextContent, StringComparison.Ordinal);
        Assert.True(int.Parse(cut.Find("[data-testid=timeline-chart]").GetAttribute("data-series")!, System.Globalization.CultureInfo.InvariantCulture) > 6);
        Assert.NotEmpty(cut.FindAll("[data-testid=perf-row]"));
        Assert.NotEmpty(cut.FindAll("[data-testid=audit-row]"));
        var render = Assert.Single(JSInterop.Invocations, i => i.Identifier == "opslvpReview.render");
        Assert.Contains("\"markArea\"", (string)render.Arguments[1]!, StringComparison.Ordinal);
        Assert.EndsWith($"/api/episodes/{id}/export.json", cut.Find("[data-testid=export-json]").GetAttribute("href"), StringComparison.Ordinal);
    }

    [Fact]
    public void EpisodePage_TamperedEntry_ShowsTheBrokenChainAndTheEntry()
    {
        var record = DemoNightSource.Record;
        var id = EpisodeModel.Build(record.Events, record.Readings, DateTimeOffset.MaxValue)[0].Id;
        var start = EpisodeModel.Build(record.Events, record.Readings, DateTimeOffset.MaxValue)[0].Start;
        var target = record.Audit.First(a => a.Time > start.AddMinutes(30)).Sequence;
        Services.AddSingleton<TimeProvider>(new FakeTimeProvider(new DateTimeOffset(2026, 1, 16, 6, 0, 0, TimeSpan.Zero)));
        Services.AddSingleton<IEpisodeSource>(new DemoNightSource { TamperSequence = target });
        Services.AddSingleton<ReviewService>();

        var cut = Render<ReviewEpisode>(p => p.Add(c => c.EpisodeId, id));

        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=episode-summary]")));
        Assert.Contains("does NOT verify", cut.Find("[data-testid=summary-integrity]").TextContent, StringComparison.Ordinal);
        Assert.Contains($"Entry {target}: HashMismatch", cut.Find("[data-testid=audit-integrity]").TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public void EpisodePage_UnknownEpisode_SaysNoEpisode()
    {
        Services.AddSingleton<TimeProvider>(TimeProvider.System);
        Services.AddSingleton<IEpisodeSource>(new DemoNightSource());
        Services.AddSingleton<ReviewService>();

        var cut = Render<ReviewEpisode>(p => p.Add(c => c.EpisodeId, "XDMO-nope"));

        cut.WaitForAssertion(() => Assert.Contains("No episode 'XDMO-nope'", cut.Find("[data-testid=review-missing]").TextContent, StringComparison.Ordinal));
    }
}
