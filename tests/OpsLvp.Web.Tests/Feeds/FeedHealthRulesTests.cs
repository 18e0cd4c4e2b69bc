using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>The health rule of docs/feeds.md ("Health"); thresholds are OpsLvp's own choice (common practice for liveness checks).</summary>
public sealed class FeedHealthRulesTests
{
    private static readonly DateTimeOffset s_now = new(2026, 1, 15, 3, 0, 0, TimeSpan.Zero);
    private static readonly TimeSpan s_stale = TimeSpan.FromSeconds(45);

    [Fact]
    public void NothingYet_IsDegraded_AwaitingFirstDelivery()
    {
        var (status, detail) = FeedHealthRules.Evaluate(null, 0, 0, s_stale, s_now);

        Assert.Equal((FeedStatus.Degraded, "awaiting first delivery"), (status, detail));
    }

    [Fact]
    public void NeverDelivered_AndFailed_IsDown()
    {
        Assert.Equal(FeedStatus.Down, FeedHealthRules.Evaluate(null, 1, 0, s_stale, s_now).Status);
    }

    [Theory]
    [InlineData(1, FeedStatus.Degraded)]
    [InlineData(2, FeedStatus.Degraded)]
    [InlineData(3, FeedStatus.Down)]
    [InlineData(10, FeedStatus.Down)]
    public void FailuresInARow_AfterGoodDelivery_DegradeThenDown(int failures, FeedStatus expected)
    {
        Assert.Equal(expected, FeedHealthRules.Evaluate(s_now, failures, 0, s_stale, s_now).Status);
    }

    [Fact]
    public void FreshGoodDelivery_IsOk()
    {
        Assert.Equal((FeedStatus.Ok, (string?)null), FeedHealthRules.Evaluate(s_now - s_stale, 0, 0, s_stale, s_now));
    }

    [Fact]
    public void GoodDelivery_OlderThanStaleWindow_IsDegraded()
    {
        var (status, detail) = FeedHealthRules.Evaluate(s_now - s_stale - TimeSpan.FromSeconds(1), 0, 0, s_stale, s_now);

        Assert.Equal(FeedStatus.Degraded, status);
        Assert.Equal("stale: no good delivery within 00:00:45", detail);
    }

    [Fact]
    public void NoStaleWindow_NeverGoesStale()
    {
        Assert.Equal(FeedStatus.Ok, FeedHealthRules.Evaluate(s_now - TimeSpan.FromDays(3), 0, 0, null, s_now).Status);
    }

    [Fact]
    public void LastDeliveryWithRejections_IsDegraded()
    {
        Assert.Equal((FeedStatus.Degraded, "last delivery had 2 rejected item(s)"), FeedHealthRules.Evaluate(s_now, 0, 2, s_stale, s_now));
    }
}
