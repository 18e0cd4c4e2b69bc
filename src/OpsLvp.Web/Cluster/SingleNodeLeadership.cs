using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Cluster;

/// <summary>The embedded default: one node, always the leader, epoch 0.</summary>
public sealed class SingleNodeLeadership(IOptions<ClusterOptions> options) : ILeadership
{
    public string NodeId { get; } = options.Value.ResolvedNodeId;

    public bool IsLeader => true;

    public long Epoch => 0;

    public event Action<bool>? LeadershipChanged
    {
        add { }
        remove { }
    }
}
