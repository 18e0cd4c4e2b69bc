namespace OpsLvp.Web.Feeds;

/// <summary>
/// The node's part of <c>/health</c> (docs/deployment.md "Which node am I: /health"): which node answers, its role, and
/// what it hears of the others.
/// </summary>
/// <param name="Id">This node's name (<c>Cluster:NodeId</c>, else machine name and process id).</param>
/// <param name="Role"><c>single</c> (one node: no election, no fan-out), <c>leader</c> (runs the engine) or <c>standby</c>.</param>
/// <param name="Epoch">The leadership epoch: this node's while it leads, the one of the last leader state received on a standby; null when none is known (single node, or nothing received yet).</param>
/// <param name="Fanout"><c>not configured</c> (no <c>Cluster:Redis</c>), <c>connected</c> or <c>unreachable</c>.</param>
/// <param name="LastLeaderStateAt">On a standby: real UTC time the last state from the leader arrived; null on a leader, a single node, or before the first.</param>
/// <param name="Live">False on a standby that has heard no leader state for <c>Cluster:LeaderSilence</c> (its screens say NOT LIVE, or it has nothing to show yet).</param>
/// <param name="CommandsRefused">Forwarded commands this node refused while leading since it started: not sealed by this installation, stale, replayed or malformed (docs/engine.md R77).</param>
/// <param name="LastCommandRefusal">Why the last one was refused, else null.</param>
/// <param name="InboxWaiting">Several nodes: reading batches pushed to a standby that wait in the reading inbox for the leader (docs/engine.md R73–R74); null on a single node or when the database did not answer.</param>
/// <param name="InboxOldestReceivedAt">When the oldest of them was received (the receiving node's clock), else null.</param>
/// <param name="InboxMaxBatches">Several nodes: <c>Cluster:InboxMaxBatches</c>, the most batches the inbox holds (docs/engine.md R80); null on a single node.</param>
/// <param name="InboxRefused">Several nodes: pushes this node refused with 503 since its start because the inbox was full; null on a single node.</param>
/// <param name="InboxSetAside">Several nodes: inbox batches this node set aside while leading since its start (docs/engine.md R82); null on a single node.</param>
public sealed record NodeHealth(string Id, string Role, long? Epoch, string Fanout, DateTimeOffset? LastLeaderStateAt, bool Live, long CommandsRefused, string? LastCommandRefusal,
    int? InboxWaiting = null, DateTimeOffset? InboxOldestReceivedAt = null, int? InboxMaxBatches = null, long? InboxRefused = null, long? InboxSetAside = null);
