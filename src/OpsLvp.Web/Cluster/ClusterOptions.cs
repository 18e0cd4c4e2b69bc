namespace OpsLvp.Web.Cluster;

/// <summary>Settings of section <c>Cluster</c> (docs/deployment.md "Several nodes").</summary>
public sealed class ClusterOptions
{
    public const string SectionName = "Cluster";

    /// <summary>This node's name; empty means machine name and process id.</summary>
    public string NodeId { get; set; } = "";

    /// <summary>The name used: <see cref="NodeId"/>, else <c>machine-pid</c>.</summary>
    public string ResolvedNodeId => string.IsNullOrWhiteSpace(NodeId) ? $"{Environment.MachineName}-{Environment.ProcessId}" : NodeId.Trim();

    /// <summary>
    /// On PostgreSQL: how often a standby tries to take leadership, and a leader checks it still holds it
    /// (docs/deployment.md "PostgreSQL and several nodes"). Between 100 ms and 10 s.
    /// </summary>
    public TimeSpan LeaderRetryInterval { get; set; } = TimeSpan.FromSeconds(1);

    /// <summary>
    /// On PostgreSQL: how often the leader looks into the reading inbox even without a notification, so a lost
    /// <c>NOTIFY</c> only delays readings pushed to a standby (docs/engine.md R74). Between 100 ms and 1 min.
    /// </summary>
    public TimeSpan InboxPollInterval { get; set; } = TimeSpan.FromSeconds(2);
}
