namespace OpsLvp.Web.Feeds;

/// <summary>
/// One TAF text feed (<c>Feeds:Taf:{i}</c>, docs/feeds.md "TAF feeds"): an http(s) URL or a file path whose text holds
/// TAFs, each ended by <c>=</c> or starting with <c>TAF</c> on a new line. Durations are real (network) time, even in
/// demo mode.
/// </summary>
public sealed class TafFeedOptions
{
    /// <summary>Unique feed name; health is reported under <c>taf:{Name}</c>.</summary>
    public string Name { get; set; } = "";

    /// <summary>Absolute http(s) URL, or a file path (relative paths are looked up from the content root upwards).</summary>
    public string Source { get; set; } = "";

    /// <summary>TAFs are issued every few hours (amendments at any time); default 5 min.</summary>
    public TimeSpan PollInterval { get; set; } = TimeSpan.FromMinutes(5);

    /// <summary>Timeout of one attempt.</summary>
    public TimeSpan Timeout { get; set; } = TimeSpan.FromSeconds(5);

    /// <summary>Retries after a failed HTTP attempt within one poll (0 = none).</summary>
    public int Retries { get; set; } = 2;

    public TimeSpan RetryDelay { get; set; } = TimeSpan.FromSeconds(1);

    /// <summary>Health turns degraded when the last good poll is older than this; unset = 3 × <see cref="PollInterval"/>.</summary>
    public TimeSpan? StaleAfter { get; set; }
}
