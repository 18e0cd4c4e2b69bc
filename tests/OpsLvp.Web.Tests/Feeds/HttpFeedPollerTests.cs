using OpsLvp.Core.Readings;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>The HTTP poller against a fake upstream on real Kestrel; the app under test runs on real Kestrel too.</summary>
public sealed class HttpFeedPollerTests
{
    private const string Source = "http:upstream";

    private static Dictionary<string, string?> Settings(Uri url, string name = "upstream", int index = 0, string timeout = "00:00:00.300") => new()
    {
        [$"Feeds:Http:{index}:Name"] = name,
        [$"Feeds:Http:{index}:Url"] = url.ToString(),
        [$"Feeds:Http:{index}:PollInterval"] = "00:00:00.200",
        [$"Feeds:Http:{index}:Timeout"] = timeout,
        [$"Feeds:Http:{index}:Retries"] = "1",
        [$"Feeds:Http:{index}:RetryDelay"] = "00:00:00.050",
        // these tests read the reading pipeline themselves, so the engine host must not consume it
        ["Engine:Enabled"] = "false",
    };

    [Fact]
    public async Task GoodJson_ReachesPipeline_AndHealthIsOk()
    {
        await using var upstream = await FakeUpstreamFeed.StartAsync(UpstreamMode.GoodJson);
        // A generous timeout: a slow poll on a busy machine must not turn this feed degraded (timeouts have their own test).
        await using var app = OpsLvpApp.Start(Settings(upstream.Url, timeout: "00:00:05"));

        var batch = await app.NextBatchAsync(b => b.Source == Source);

        Assert.Empty(batch.Rejections);
        Assert.Equal(2, batch.Readings.Count);
        Assert.Equal(new Reading(new DateTimeOffset(2026, 1, 15, 3, 0, 0, TimeSpan.Zero), "RVR09T", ReadingKind.Rvr, 550, ReadingStatus.Ok), batch.Readings[0]);
        // +01:00 offset is converted to UTC.
        Assert.Equal(new DateTimeOffset(2026, 1, 15, 2, 0, 0, TimeSpan.Zero), batch.Readings[1].Time);
        Assert.Equal(ReadingKind.CloudBase, batch.Readings[1].Kind);

        var health = await Eventually.ValueAsync(() => app.Health.Get(Source), h => h.LastGoodAt is not null, "a good poll");
        Assert.Equal(FeedStatus.Ok, health.Status);
        Assert.Equal(0, health.ConsecutiveFailures);
        Assert.Equal(2, health.LastAccepted);
        var feed = await app.GetFeedHealthAsync(Source);
        Assert.Equal("ok", feed.GetProperty("status").GetString());
    }

    [Fact]
    public async Task Http500_IsRetried_RecordedAsFailure_AndNothingReachesPipeline()
    {
        await using var upstream = await FakeUpstreamFeed.StartAsync(UpstreamMode.Http500);
        // A generous timeout here, so a slow first connection on a busy machine cannot stand in for the 500.
        await using var app = OpsLvpApp.Start(Settings(upstream.Url, timeout: "00:00:05"));

        var health = await Eventually.ValueAsync(() => app.Health.Get(Source), h => h.ConsecutiveFailures >= 2, "two failed polls");

        Assert.Null(health.LastGoodAt);
        Assert.Contains("HTTP 500", health.LastError, StringComparison.Ordinal);
        Assert.Equal(FeedStatus.Down, health.Status);
        // Retries = 1: each failed poll is two requests.
        Assert.True(upstream.Requests >= 4, $"expected retried requests, saw {upstream.Requests}");
        Assert.False(app.Pipeline.TryRead(out _));
        var feed = await app.GetFeedHealthAsync(Source);
        Assert.Equal("down", feed.GetProperty("status").GetString());
    }

    [Fact]
    public async Task HangPastTimeout_IsCutOff_AndServerStaysResponsive()
    {
        await using var upstream = await FakeUpstreamFeed.StartAsync(UpstreamMode.Hang);
        await using var app = OpsLvpApp.Start(Settings(upstream.Url));

        var health = await Eventually.ValueAsync(() => app.Health.Get(Source), h => h.ConsecutiveFailures >= 1, "a timed-out poll");

        Assert.Contains("timed out after 0.3 s (2 attempt(s))", health.LastError, StringComparison.Ordinal);
        Assert.False(app.Pipeline.TryRead(out _));
        var started = DateTime.UtcNow;
        await app.GetHealthAsync();
        Assert.True(DateTime.UtcNow - started < TimeSpan.FromSeconds(2), "/health must not wait for a hanging feed");
    }

    [Fact]
    public async Task GarbageBytes_AreAFailure_NotABatch()
    {
        await using var upstream = await FakeUpstreamFeed.StartAsync(UpstreamMode.Garbage);
        await using var app = OpsLvpApp.Start(Settings(upstream.Url, timeout: "00:00:05"));

        var health = await Eventually.ValueAsync(() => app.Health.Get(Source), h => h.ConsecutiveFailures >= 1, "a failed parse");

        Assert.Equal("bad document: body is not valid UTF-8 (first bad byte at offset 0)", health.LastError);
        Assert.False(app.Pipeline.TryRead(out _));
        await app.GetHealthAsync();
    }

    [Fact]
    public async Task PartiallyMalformedItems_GoodOnesPass_BadOnesAreRejectedWithDetail()
    {
        await using var upstream = await FakeUpstreamFeed.StartAsync(UpstreamMode.PartiallyMalformed);
        // A generous timeout: a slow poll on a busy machine must not turn this feed degraded (timeouts have their own test).
        await using var app = OpsLvpApp.Start(Settings(upstream.Url, timeout: "00:00:05"));

        var batch = await app.NextBatchAsync(b => b.Source == Source);

        var reading = Assert.Single(batch.Readings);
        Assert.Equal("RVR09T", reading.SensorId);
        Assert.Equal(500, reading.Value);
        Assert.Collection(batch.Rejections,
            r =>
            {
                Assert.Equal((1, RejectReason.Malformed, "RVR09M"), (r.Index, r.Reason, r.SensorId));
                Assert.Contains("kind 'fogginess' is not one of", r.Detail, StringComparison.Ordinal);
            },
            r =>
            {
                Assert.Equal((2, RejectReason.Malformed), (r.Index, r.Reason));
                Assert.Contains("is not ISO-8601 with an offset", r.Detail, StringComparison.Ordinal);
            });
        var health = await Eventually.ValueAsync(() => app.Health.Get(Source), h => h.LastGoodAt is not null, "a good poll");
        Assert.Equal(FeedStatus.Degraded, health.Status);
        Assert.Equal(2, health.LastRejected);
    }

    [Fact]
    public async Task FailingFeed_RecoversToOk_WhenUpstreamComesBack()
    {
        await using var upstream = await FakeUpstreamFeed.StartAsync(UpstreamMode.Http500);
        // A generous timeout: a slow poll on a busy machine must not turn this feed degraded (timeouts have their own test).
        await using var app = OpsLvpApp.Start(Settings(upstream.Url, timeout: "00:00:05"));
        await Eventually.ValueAsync(() => app.Health.Get(Source), h => h.ConsecutiveFailures >= 1, "a failed poll");

        upstream.Mode = UpstreamMode.GoodJson;

        await app.NextBatchAsync(b => b.Source == Source);
        var health = await Eventually.ValueAsync(() => app.Health.Get(Source), h => h.ConsecutiveFailures == 0, "recovery");
        Assert.Equal(FeedStatus.Ok, health.Status);
        Assert.Contains("HTTP 500", health.LastError, StringComparison.Ordinal);
    }

    [Fact]
    public async Task HangingFeed_DoesNotHoldUpAnotherFeed()
    {
        await using var hanging = await FakeUpstreamFeed.StartAsync(UpstreamMode.Hang);
        await using var good = await FakeUpstreamFeed.StartAsync(UpstreamMode.GoodJson);
        var settings = Settings(hanging.Url, "stuck", 0);
        foreach (var (key, value) in Settings(good.Url, "fine", 1))
        {
            settings[key] = value;
        }

        await using var app = OpsLvpApp.Start(settings);

        var first = await app.NextBatchAsync(b => b.Source == "http:fine");
        var second = await app.NextBatchAsync(b => b.Source == "http:fine");
        Assert.Equal(2, first.Readings.Count);
        Assert.Equal(2, second.Readings.Count);
        var stuck = await Eventually.ValueAsync(() => app.Health.Get("http:stuck"), h => h.ConsecutiveFailures >= 1, "the stuck feed failing");
        Assert.Equal(FeedStatus.Down, stuck.Status);
        var health = await app.GetHealthAsync();
        Assert.Equal("down", health.GetProperty("feedsStatus").GetString());
        Assert.Equal("ok", health.GetProperty("status").GetString());
    }
}
