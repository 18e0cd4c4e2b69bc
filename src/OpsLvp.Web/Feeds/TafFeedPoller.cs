using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Polls every <c>Feeds:Taf</c> entry like <see cref="MetarFeedPoller"/> (docs/feeds.md "TAF feeds"): fetch the text
/// (HTTP with timeout and back-off retries, or a file), split it into TAFs (<see cref="Split"/>), decode each with
/// <see cref="TafDecoder"/> and hand the decoded ones to the <see cref="ReadingPipeline"/> as forecast inputs
/// (docs/engine.md R25). A TAF that does not decode is a <see cref="RejectReason.Malformed"/> rejection with the
/// decoder's reason, logged and counted in the feed's health; the rest of the text still counts. The same TAF polled
/// again is nothing new to the engine. A failing feed only changes its own health.
/// </summary>
public sealed class TafFeedPoller(
    IOptions<FeedsOptions> options,
    IHttpClientFactory httpClientFactory,
    ContentPaths paths,
    ReadingPipeline pipeline,
    FeedHealthRegistry health,
    DemoMode demoMode,
    TimeProvider appClock,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider networkClock,
    ILogger<TafFeedPoller> logger) : BackgroundService
{
    public static string SourceName(TafFeedOptions feed) => "taf:" + feed.Name;

    protected override Task ExecuteAsync(CancellationToken stoppingToken)
    {
        var feeds = options.Value.Taf;
        foreach (var feed in feeds)
        {
            var stale = feed.StaleAfter ?? feed.PollInterval * 3;
            health.Register(SourceName(feed), "taf", demoMode.Enabled ? stale * demoMode.Speed : stale);
        }
        return Task.WhenAll(feeds.Select(feed => RunFeedAsync(feed, stoppingToken)));
    }

    /// <summary>
    /// The TAFs in a text: when it holds <c>=</c>, each report ends with one; otherwise a line starting with <c>TAF</c>
    /// starts a report and the lines after it continue it, and without any such line each line is a report. Blank
    /// lines and lines starting with <c>#</c> are skipped; a report's lines are joined with single spaces.
    /// </summary>
    public static IReadOnlyList<string> Split(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var lines = text.Split('\n').Select(l => l.Trim()).Where(l => l.Length > 0 && !l.StartsWith('#')).ToList();
        var joined = string.Join('\n', lines);
        if (joined.Contains('=', StringComparison.Ordinal))
        {
            return joined.Split('=').Select(Normalise).Where(r => r.Length > 0).ToList();
        }
        if (!lines.Any(StartsTaf))
        {
            return lines.Select(Normalise).ToList();
        }
        var reports = new List<string>();
        foreach (var line in lines)
        {
            if (StartsTaf(line) || reports.Count == 0)
            {
                reports.Add(line);
            }
            else
            {
                reports[^1] += " " + line;
            }
        }
        return reports.Select(Normalise).ToList();
    }

    private static bool StartsTaf(string line) =>
        line.StartsWith("TAF ", StringComparison.OrdinalIgnoreCase) || line.Equals("TAF", StringComparison.OrdinalIgnoreCase);

    private static string Normalise(string report) =>
        string.Join(' ', report.Split((char[])[' ', '\n', '\t', '\r'], StringSplitOptions.RemoveEmptyEntries));

    /// <summary>The batch for one fetched text (public for tests): a forecast input per decoded TAF, a rejection per bad one.</summary>
    public static ReadingBatch ToBatch(string text, string source, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(text);
        var forecasts = new List<ForecastInput>();
        var rejections = new List<ReadingRejection>();
        var index = 0;
        foreach (var report in Split(text))
        {
            if (TafDecoder.TryDecode(report, out var taf, out var error) && taf is not null)
            {
                forecasts.Add(new ForecastInput(ForecastOrigin.Taf, report, now));
            }
            else
            {
                rejections.Add(new ReadingRejection(index, RejectReason.Malformed, $"TAF not decoded: {error}"));
            }
            index++;
        }
        return new ReadingBatch(source, now, [], rejections) { Forecasts = forecasts };
    }

    private async Task RunFeedAsync(TafFeedOptions feed, CancellationToken stoppingToken)
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
                var batch = ToBatch(text, source, appClock.GetUtcNow());
                foreach (var rejection in batch.Rejections)
                {
                    logger.LogWarning("TAF feed {Feed}: report {Index} rejected: {Detail}", source, rejection.Index, rejection.Detail);
                }
                await pipeline.SubmitAsync(batch, stoppingToken);
                health.RecordSuccess(source, batch.Forecasts.Count, batch.Rejections.Count);
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex)
            {
                var error = TextFeedSource.Describe(ex, feed.Timeout);
                health.RecordFailure(source, error);
                logger.LogWarning("TAF feed {Feed} poll failed: {Error}", source, error);
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
