namespace OpsLvp.Web.Live;

/// <summary>Configuration section <c>Live</c>: how live state reaches screens and hub clients (docs/feeds.md, "Live state").</summary>
public sealed class LiveOptions
{
    public const string SectionName = "Live";

    /// <summary>
    /// Most snapshots a subscriber (each Blazor circuit, and the hub broadcast to every client) receives per second, real
    /// time; default 4. Snapshots in between are coalesced: the latest is always delivered when the interval is up, and
    /// a snapshot with a new phase goes out at once. 0.01 to 1000.
    /// </summary>
    public double MaxStatesPerSecond { get; set; } = 4;

    /// <summary>Real time between two deliveries to one subscriber.</summary>
    public TimeSpan MinInterval => TimeSpan.FromSeconds(1 / MaxStatesPerSecond);
}
