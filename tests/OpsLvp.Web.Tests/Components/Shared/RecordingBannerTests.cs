using Bunit;
using OpsLvp.Web.Components.Shared;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Shared;

/// <summary>The "NOT RECORDING since" banner every live screen carries (docs/reliability.md "Storage faults"). Times are invented.</summary>
public sealed class RecordingBannerTests : LiveComponentTest
{
    [Fact]
    public void WhileRecording_ShowsNothing()
    {
        SignedOut();
        Live.Set(TestSnapshots.Make(1) with { Recording = RecordingView.Ok });
        var cut = Render<RecordingBanner>();
        Assert.Empty(cut.FindAll("[data-testid=not-recording]"));
    }

    [Fact]
    public void NotRecording_SaysSinceWhenToTheSecond_AndWhy()
    {
        SignedOut();
        var since = TestSnapshots.T0.AddMinutes(4).AddSeconds(7);
        Live.Set(TestSnapshots.Make(1) with { Recording = new RecordingView(false, since, "audit entries not committed: database or disk is full") });
        var cut = Render<RecordingBanner>();
        var banner = cut.Find("[data-testid=not-recording]");
        Assert.Equal("NOT RECORDING since 03:04:07Z", banner.QuerySelector("strong")!.TextContent);
        Assert.Contains("database or disk is full", banner.TextContent, StringComparison.Ordinal);
    }

    [Fact]
    public async Task WhenRecordingResumes_TheBannerGoes()
    {
        SignedOut();
        Live.Set(TestSnapshots.Make(1) with { Recording = new RecordingView(false, TestSnapshots.T0, "disk full (invented)") });
        var cut = Render<RecordingBanner>();
        Assert.Single(cut.FindAll("[data-testid=not-recording]"));
        await Live.PublishAsync(TestSnapshots.Make(2) with { Recording = RecordingView.Ok });
        cut.WaitForAssertion(() => Assert.Empty(cut.FindAll("[data-testid=not-recording]")), TimeSpan.FromSeconds(10));
    }
}
