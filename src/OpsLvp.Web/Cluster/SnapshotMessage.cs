using OpsLvp.Web.Live;

namespace OpsLvp.Web.Cluster;

/// <summary>What the leader publishes on the snapshot channel: its node, its leadership epoch and the snapshot.</summary>
public sealed record SnapshotMessage(string Node, long Epoch, LiveSnapshot Snapshot);
