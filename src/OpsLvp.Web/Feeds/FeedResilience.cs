using Microsoft.Extensions.Http.Resilience;
using Polly;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// The retry-then-timeout pipeline every polling feed uses: up to <c>retries</c> extra attempts with exponential
/// back-off and jitter (network errors, timeouts, 408, 429, 5xx), each attempt bounded by <c>timeout</c>, timed on
/// the real network clock even in demo mode.
/// </summary>
internal static class FeedResilience
{
    public static ResiliencePipeline<HttpResponseMessage> Build(TimeProvider networkClock, int retries, TimeSpan retryDelay, TimeSpan timeout)
    {
        var builder = new ResiliencePipelineBuilder<HttpResponseMessage> { TimeProvider = networkClock };
        if (retries > 0)
        {
            builder.AddRetry(new HttpRetryStrategyOptions
            {
                MaxRetryAttempts = retries,
                Delay = retryDelay,
                BackoffType = DelayBackoffType.Exponential,
                UseJitter = true,
            });
        }
        builder.AddTimeout(timeout);
        return builder.Build();
    }
}
