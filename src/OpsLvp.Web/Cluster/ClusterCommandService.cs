using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// <see cref="ILvpCommandService"/> with several nodes: on the leader, the normal path (<see cref="LvpCommandService"/>);
/// on a node that does not lead, the command goes to the leader (<see cref="CommandForwarding"/>) and the person gets
/// the leader's outcome (including its refusal when the nodes' clocks differ, docs/engine.md R85), or "not applied" after
/// <c>Cluster:CommandTimeout</c>. Without <c>Cluster:Redis</c>, the normal path.
/// </summary>
public sealed class ClusterCommandService(LvpCommandService local, CommandForwarding forwarding, ILeadership leadership) : ILvpCommandService
{
    public Task<CommandOutcome> ExecuteAsync(CommandCaller caller, EngineCommand command, CancellationToken cancellationToken = default) =>
        leadership.IsLeader || !forwarding.Enabled
            ? local.ExecuteAsync(caller, command, cancellationToken)
            : forwarding.ForwardAsync(caller, command, cancellationToken);
}
