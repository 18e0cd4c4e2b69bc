using OpsLvp.Web.Cluster;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// A test <see cref="ILeadership"/> a test turns on and off, standing in for the database election (built separately);
/// our interface, not our database or hub.
/// </summary>
public sealed class SwitchableLeadership(string nodeId, bool leader, long epoch) : ILeadership
{
    private volatile bool _leader = leader;
    private long _epoch = epoch;

    public string NodeId { get; } = nodeId;

    public bool IsLeader => _leader;

    public long Epoch => Interlocked.Read(ref _epoch);

    public event Action<bool>? LeadershipChanged;

    /// <summary>Makes this node lead with <paramref name="epoch"/>, or stand by.</summary>
    public void Set(bool leader, long? epoch = null)
    {
        if (epoch is { } e)
        {
            Interlocked.Exchange(ref _epoch, e);
        }
        _leader = leader;
        LeadershipChanged?.Invoke(leader);
    }
}
