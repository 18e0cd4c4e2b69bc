namespace OpsLvp.Web.Cluster;

/// <summary>
/// The Redis part of section <c>Cluster</c> (docs/deployment.md "Fan-out and commands between nodes"): the SignalR
/// backplane, snapshot fan-out and command forwarding. Bound beside <see cref="ClusterOptions"/> to the same section.
/// </summary>
public sealed class FanoutOptions
{
    /// <summary>StackExchange.Redis configuration string, e.g. <c>redis:6379</c>; empty (the default) = one node, no fan-out.</summary>
    public string Redis { get; set; } = "";

    /// <summary>Prefix of every Redis channel and key OpsLvp uses, so installations can share one Redis.</summary>
    public string RedisPrefix { get; set; } = "opslvp";

    /// <summary>How long a node that does not lead waits without a state from the leader before its screens say NOT LIVE.</summary>
    public TimeSpan LeaderSilence { get; set; } = TimeSpan.FromSeconds(10);

    /// <summary>How long a command sent from a node that does not lead waits for the leader before it is withdrawn.</summary>
    public TimeSpan CommandTimeout { get; set; } = TimeSpan.FromSeconds(10);

    public bool Enabled => !string.IsNullOrWhiteSpace(Redis);
}
