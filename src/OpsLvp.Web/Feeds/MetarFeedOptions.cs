namespace OpsLvp.Web.Feeds;

/// <summary>
/// One METAR/SPECI text feed (<c>Feeds:Metar:{i}</c>, docs/feeds.md): an http(s) URL or a file path whose text
/// holds one report per line. Durations are real (network) time, even in demo mode.
/// </summary>
public sealed class MetarFeedOptions
{
    /// <summary>Unique feed name; health is reported under <c>metar:{Name}</c>.</summary>
    public string Name { get; set; } = "";

    /// <summary>Absolute http(s) URL, or a file path (relative paths are looked up from the content root upwards).</summary>
    public string Source { get; set; } = "";

    public TimeSpan PollInterval { get; set; } = TimeSpan.FromSeconds(60);

    /// <summary>Timeout of one attempt.</summary>
    public TimeSpan Timeout { get; set; } = TimeSpan.FromSeconds(5);

    /// <summary>Retries after a failed HTTP attempt within one poll (0 = none).</summary>
    public int Retries { get; set; } = 2;

    public TimeSpan RetryDelay { get; set; } = TimeSpan.FromSeconds(1);

    /// <summary>Runway designator as written in the RVR group (e.g. <c>07L</c>) → profile sensor id.</summary>
    public Dictionary<string, string> RvrSensorByRunway { get; set; } = [];

    /// <summary>Profile sensor id for the prevailing visibility (a visibility sensor standing for the station).</summary>
    public string? VisibilitySensorId { get; set; }

    /// <summary>Profile sensor id (a ceilometer) for the ceiling layer's base.</summary>
    public string? CloudBaseSensorId { get; set; }

    /// <summary>Profile sensor id (a ceilometer) for the vertical visibility.</summary>
    public string? VerticalVisibilitySensorId { get; set; }

    /// <summary>Cloud base given when a report states there is no ceiling (CAVOK, NSC…); unset = none.</summary>
    public double? NoCeilingCloudBaseFeet { get; set; }

    /// <summary>Health turns degraded when the last good poll is older than this; unset = 3 × <see cref="PollInterval"/>.</summary>
    public TimeSpan? StaleAfter { get; set; }
}
