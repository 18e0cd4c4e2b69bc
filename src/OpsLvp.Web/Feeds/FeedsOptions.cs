namespace OpsLvp.Web.Feeds;

/// <summary>Configuration section <c>Feeds</c> (docs/feeds.md).</summary>
public sealed class FeedsOptions
{
    public const string SectionName = "Feeds";

    /// <summary>Polled HTTP JSON feeds, each under <c>Feeds:Http:{i}</c>.</summary>
    public List<HttpFeedOptions> Http { get; set; } = [];

    /// <summary>METAR/SPECI text feeds, each under <c>Feeds:Metar:{i}</c>.</summary>
    public List<MetarFeedOptions> Metar { get; set; } = [];

    /// <summary>TAF text feeds, each under <c>Feeds:Taf:{i}</c> (docs/feeds.md "TAF feeds").</summary>
    public List<TafFeedOptions> Taf { get; set; } = [];

    public PushIngestOptions Push { get; set; } = new();

    /// <summary>
    /// Real time within which a feed gets at most one health audit entry; changes in between are counted and carried
    /// into its next entry (docs/feeds.md, "Health in the audit"). Default 1 min; zero records every change at once.
    /// </summary>
    public TimeSpan HealthAuditInterval { get; set; } = TimeSpan.FromMinutes(1);

    /// <summary>Batches the reading pipeline holds before feeds have to wait for the consumer.</summary>
    public int PipelineCapacity { get; set; } = 1024;
}
