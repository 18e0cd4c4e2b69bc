using OpsLvp.Core.Presentation;
using OpsLvp.Web.Components.Shared;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>The screens' banner headline on a node that hears no leader, beside the storage-fault one it reuses (invented times).</summary>
public sealed class NotLiveBannerTests
{
    private static readonly DateTimeOffset s_at = new(2026, 1, 15, 3, 12, 5, TimeSpan.Zero);

    [Fact]
    public void NotLive_SaysNotLiveSinceTheLastStateReceived_AndNotRecordingStaysAsItWas()
    {
        Assert.Equal("NOT LIVE since 03:12:05Z", RecordingBanner.NotRecordingText(new RecordingView(false, s_at, NodeWords.NotLiveReason(null), NodeWords.NotLiveHeadline)));
        Assert.Equal("NOT RECORDING since 03:12:05Z", RecordingBanner.NotRecordingText(new RecordingView(false, s_at, "disk full (invented)")));
        Assert.Null(RecordingBanner.NotRecordingText(RecordingView.Ok));
    }
}
