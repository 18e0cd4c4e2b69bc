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

    /// <summary>
    /// On PostgreSQL: the most reading batches the inbox holds. A standby whose push would go beyond it answers 503 with
    /// the reason and <c>Retry-After</c> (nothing acknowledged; the feed keeps the readings) until the leader has drained
    /// some (docs/engine.md R80). Between 1 and 1 000 000.
    /// </summary>
    public int InboxMaxBatches { get; set; } = 10_000;

    /// <summary>
    /// On PostgreSQL: when the oldest batch in the inbox has waited longer than this, the leader's screens (every node's)
    /// show the <c>inbox-behind</c> alarm (docs/engine.md R81). Between 1 s and 1 h.
    /// </summary>
    public TimeSpan InboxAlarmAfter { get; set; } = TimeSpan.FromSeconds(30);

    /// <summary>
    /// On PostgreSQL: how many times the leader tries the batch at the head of the inbox alone, when its evaluation or
    /// store fails for a reason of its own (not "not recording", not "leadership lost"), before it sets the batch aside
    /// with an audit entry and an alarm (docs/engine.md R82). Between 1 and 100.
    /// </summary>
    public int InboxSetAsideAfter { get; set; } = 3;
}
