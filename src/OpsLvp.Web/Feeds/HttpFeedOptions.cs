namespace OpsLvp.Web.Feeds;

/// <summary>One polled HTTP JSON feed (<c>Feeds:Http:{i}</c>). Durations are real (network) time, even in demo mode.</summary>
public sealed class HttpFeedOptions
{
    /// <summary>Unique feed name; health is reported under <c>http:{Name}</c>.</summary>
    public string Name { get; set; } = "";

    /// <summary>Absolute http(s) URL answering GET with the OpsLvp readings JSON.</summary>
    public string Url { get; set; } = "";

    public TimeSpan PollInterval { get; set; } = TimeSpan.FromSeconds(15);

    /// <summary>Timeout of one HTTP attempt.</summary>
    public TimeSpan Timeout { get; set; } = TimeSpan.FromSeconds(5);

    /// <summary>Retries after a failed attempt within one poll (0 = none).</summary>
    public int Retries { get; set; } = 2;

    /// <summary>First retry delay; later retries back off exponentially with jitter.</summary>
    public TimeSpan RetryDelay { get; set; } = TimeSpan.FromSeconds(1);

    /// <summary>Largest response body accepted, bytes.</summary>
    public int MaxResponseBytes { get; set; } = 1024 * 1024;

    /// <summary>Health turns degraded when the last good poll is older than this; unset = 3 × <see cref="PollInterval"/>.</summary>
    public TimeSpan? StaleAfter { get; set; }
}
