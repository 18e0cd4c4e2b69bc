namespace OpsLvp.Web.Cluster;

/// <summary>
/// Whether this node runs the engine (docs/deployment.md "Several nodes"). On the embedded default there is one node and
/// it always leads (<see cref="SingleNodeLeadership"/>); with several nodes on PostgreSQL exactly one leads at a time and
/// the others are hot standbys serving pages, the hub, <c>/api/state</c>, push ingest and commands.
/// </summary>
public interface ILeadership
{
    /// <summary>This node's name in the cluster (<c>Cluster:NodeId</c>, else machine name and process id).</summary>
    string NodeId { get; }

    /// <summary>True while this node holds leadership and may evaluate and append.</summary>
    bool IsLeader { get; }

    /// <summary>The leadership epoch (fencing token) this node holds while it leads; 0 on a single node.</summary>
    long Epoch { get; }

    /// <summary>Raised, on any thread, when <see cref="IsLeader"/> changes; the argument is the new value.</summary>
    event Action<bool>? LeadershipChanged;
}
