using System.Globalization;
using Microsoft.Extensions.Options;
using OpsLvp.Web.Time;
using Polly;
using Polly.Timeout;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Polls every <c>Feeds:Http</c> entry on its own loop: GET with a per-attempt timeout and exponential
/// back-off retries, parse, hand the batch to the <see cref="ReadingPipeline"/>, record health.
/// A failing feed never stops the other feeds or the server. Network timing runs on real time.
/// </summary>
public sealed class HttpFeedPoller(
    IOptions<FeedsOptions> options,
    IHttpClientFactory httpClientFactory,
    ReadingPipeline pipeline,
    FeedHealthRegistry health,
    DemoMode demoMode,
    TimeProvider appClock,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider networkClock,
    ILogger<HttpFeedPoller> logger) : BackgroundService
{
    /// <summary>Name of the <see cref="HttpClient"/> the poller asks the factory for.</summary>
    public const string HttpClientName = "opslvp-feeds";

    /// <summary>Health and batch source name of a feed.</summary>
    public static string SourceName(HttpFeedOptions feed) => "http:" + feed.Name;

    protected override Task ExecuteAsync(CancellationToken stoppingToken)
    {
        var feeds = options.Value.Http;
        foreach (var feed in feeds)
        {
            var stale = feed.StaleAfter ?? feed.PollInterval * 3;
            // Health times are app-clock; in demo mode app time runs Speed times faster than the poll loop.
            health.Register(SourceName(feed), "http", demoMode.Enabled ? stale * demoMode.Speed : stale);
        }

        return Task.WhenAll(feeds.Select(feed => RunFeedAsync(feed, stoppingToken)));
    }

    private async Task RunFeedAsync(HttpFeedOptions feed, CancellationToken stoppingToken)
    {
        await Task.Yield();
        var source = SourceName(feed);
        var resilience = FeedResilience.Build(networkClock, feed.Retries, feed.RetryDelay, feed.Timeout);
        using var client = httpClientFactory.CreateClient(HttpClientName);
        client.Timeout = Timeout.InfiniteTimeSpan;
        client.MaxResponseContentBufferSize = feed.MaxResponseBytes;
        var url = new Uri(feed.Url, UriKind.Absolute);

        while (!stoppingToken.IsCancellationRequested)
        {
            try
            {
                await PollOnceAsync(source, client, url, resilience, stoppingToken);
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex)
            {
                // A feed's failure of any kind is health data, never a crash of the server.
                var error = Describe(ex, feed);
                health.RecordFailure(source, error);
                logger.LogWarning("Feed {Feed} poll failed: {Error}", source, error);
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

    private async Task PollOnceAsync(string source, HttpClient client, Uri url, ResiliencePipeline<HttpResponseMessage> resilience, CancellationToken stoppingToken)
    {
        using var response = await resilience.ExecuteAsync(
            async token => await client.GetAsync(url, HttpCompletionOption.ResponseContentRead, token),
            stoppingToken);
        if (!response.IsSuccessStatusCode)
        {
            throw new HttpRequestException(string.Create(CultureInfo.InvariantCulture, $"HTTP {(int)response.StatusCode} {response.ReasonPhrase}"), null, response.StatusCode);
        }

        var body = await response.Content.ReadAsByteArrayAsync(stoppingToken);
        var parsed = ReadingJsonParser.Parse(body);
        await pipeline.SubmitAsync(parsed.ToBatch(source, appClock.GetUtcNow()), stoppingToken);
        health.RecordSuccess(source, parsed.Readings.Count, parsed.Rejections.Count);
        if (parsed.Rejections.Count > 0)
        {
            logger.LogWarning("Feed {Feed}: {Rejected} malformed item(s), first: {Detail}", source, parsed.Rejections.Count, parsed.Rejections[0].Detail);
        }
    }


    private static string Describe(Exception ex, HttpFeedOptions feed) => ex switch
    {
        TimeoutRejectedException => string.Create(CultureInfo.InvariantCulture, $"timed out after {feed.Timeout.TotalSeconds:0.###} s ({feed.Retries + 1} attempt(s))"),
        FeedFormatException f => "bad document: " + f.Message,
        HttpRequestException h => "request failed: " + h.Message,
        _ => ex.GetType().Name + ": " + ex.Message,
    };
}
