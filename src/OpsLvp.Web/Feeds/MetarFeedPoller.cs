using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Metar;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Polls every <c>Feeds:Metar</c> entry: fetch the text (HTTP with timeout and back-off retries, or a file), decode
/// each line with <see cref="MetarDecoder"/>, turn it into readings with <see cref="MetarReport.ToReadings"/> at the
/// observation time resolved near the app clock, and hand them to the <see cref="ReadingPipeline"/>. A line that does
/// not decode is a <see cref="RejectReason.Malformed"/> rejection; a report already sent gives duplicates that the
/// engine rejects. A report with a TREND also gives a forecast input (docs/engine.md R25). A failing feed only changes
/// its own health.
/// </summary>
public sealed class MetarFeedPoller(
    IOptions<FeedsOptions> options,
    IHttpClientFactory httpClientFactory,
    ContentPaths paths,
    ReadingPipeline pipeline,
    FeedHealthRegistry health,
    DemoMode demoMode,
    TimeProvider appClock,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider networkClock,
    ILogger<MetarFeedPoller> logger) : BackgroundService
{
    public static string SourceName(MetarFeedOptions feed) => "metar:" + feed.Name;

    protected override Task ExecuteAsync(CancellationToken stoppingToken)
    {
        var feeds = options.Value.Metar;
        foreach (var feed in feeds)
        {
            var stale = feed.StaleAfter ?? feed.PollInterval * 3;
            health.Register(SourceName(feed), "metar", demoMode.Enabled ? stale * demoMode.Speed : stale);
        }
        return Task.WhenAll(feeds.Select(feed => RunFeedAsync(feed, stoppingToken)));
    }

    /// <summary>The batch for one fetched text (public for tests): readings of every decoded line, a rejection per bad line.</summary>
    public static ReadingBatch ToBatch(string text, MetarFeedOptions feed, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(text);
        var map = new MetarSensorMap(feed.RvrSensorByRunway, feed.VisibilitySensorId, feed.CloudBaseSensorId, feed.VerticalVisibilitySensorId, feed.NoCeilingCloudBaseFeet);
        var readings = new List<Reading>();
        var forecasts = new List<ForecastInput>();
        var rejections = new List<ReadingRejection>();
        var index = 0;
        foreach (var raw in text.Split('\n'))
        {
            var line = raw.Trim().TrimEnd('=');
            if (line.Length == 0 || line.StartsWith('#'))
            {
                continue;
            }
            if (MetarDecoder.TryDecode(line, out var report, out var error) && report is not null)
            {
                readings.AddRange(report.ToReadings(report.Time.ResolveNear(now), map));
                if (!string.IsNullOrWhiteSpace(report.Trend))
                {
                    // the TREND is a forecast input (docs/engine.md R25); the engine refuses one it cannot decode, with its reason
                    forecasts.Add(new ForecastInput(ForecastOrigin.Trend, line, now));
                }
            }
            else
            {
                rejections.Add(new ReadingRejection(index, RejectReason.Malformed, $"METAR not decoded: {error}"));
            }
            index++;
        }
        return new ReadingBatch(SourceName(feed), now, readings, rejections) { Forecasts = forecasts };
    }

    private async Task RunFeedAsync(MetarFeedOptions feed, CancellationToken stoppingToken)
    {
        await Task.Yield();
        var source = SourceName(feed);
        var url = TextFeedSource.HttpUrl(feed.Source);
        var resilience = FeedResilience.Build(networkClock, feed.Retries, feed.RetryDelay, feed.Timeout);
        using var client = httpClientFactory.CreateClient(HttpFeedPoller.HttpClientName);
        client.Timeout = System.Threading.Timeout.InfiniteTimeSpan;
        while (!stoppingToken.IsCancellationRequested)
        {
            try
            {
                var text = await TextFeedSource.ReadAsync(feed.Source, url, client, resilience, paths, stoppingToken);
                var batch = ToBatch(text, feed, appClock.GetUtcNow());
                await pipeline.SubmitAsync(batch, stoppingToken);
                health.RecordSuccess(source, batch.Readings.Count, batch.Rejections.Count);
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex)
            {
                var error = TextFeedSource.Describe(ex, feed.Timeout);
                health.RecordFailure(source, error);
                logger.LogWarning("METAR feed {Feed} poll failed: {Error}", source, error);
            }
            try
            {
                await Task.Delay(feed.PollInterval, networkClock, stoppingToken);
            }
            catch (OperationCanceledException)
            {
                return;
            }
        }
    }
}
