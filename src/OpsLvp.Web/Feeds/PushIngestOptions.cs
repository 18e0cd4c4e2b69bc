namespace OpsLvp.Web.Feeds;

/// <summary>Push ingest <c>POST /api/readings</c> (<c>Feeds:Push</c>).</summary>
public sealed class PushIngestOptions
{
    /// <summary>Accepted keys for the <c>X-Api-Key</c> header; none = push ingest refuses every request.</summary>
    public List<PushApiKey> ApiKeys { get; set; } = [];

    /// <summary>Largest request body accepted, bytes; larger requests get 413.</summary>
    public int MaxBodyBytes { get; set; } = 256 * 1024;

    /// <summary>Most readings accepted in one request; more gets 413 and none of them is taken.</summary>
    public int MaxReadings { get; set; } = 500;
}
