namespace OpsLvp.Web.Cluster;

/// <summary>Settings of section <c>Cluster</c> (docs/deployment.md "Several nodes").</summary>
public sealed class ClusterOptions
{
    public const string SectionName = "Cluster";

    /// <summary>This node's name; empty means machine name and process id.</summary>
    public string NodeId { get; set; } = "";

    /// <summary>The name used: <see cref="NodeId"/>, else <c>machine-pid</c>.</summary>
    public string ResolvedNodeId => string.IsNullOrWhiteSpace(NodeId) ? $"{Environment.MachineName}-{Environment.ProcessId}" : NodeId.Trim();
}
