using Microsoft.AspNetCore.SignalR;
using OpsLvp.Web.Cluster;

namespace OpsLvp.Web.Live;

/// <summary>
/// Sends every snapshot this node shows to the hub clients connected to this node (a subscriber of
/// <see cref="ILiveState"/>). With several nodes each shows the leader's snapshots itself, so each sends them to its own
/// clients only (<see cref="ClusterHubLifetimeManager{THub}.SendAllLocalAsync"/>), and a client gets each state once.
/// </summary>
public sealed class HubBroadcaster(ILiveState live, IHubContext<LvpHub> hub, HubLifetimeManager<LvpHub> lifetime, ILogger<HubBroadcaster> logger) : IHostedService
{
    private IDisposable? _subscription;

    public Task StartAsync(CancellationToken cancellationToken)
    {
        _subscription = live.Subscribe(async snapshot =>
        {
            try
            {
                if (lifetime is ClusterHubLifetimeManager<LvpHub> cluster)
                {
                    await cluster.SendAllLocalAsync(LvpHub.StateMethod, [snapshot]);
                }
                else
                {
                    await hub.Clients.All.SendAsync(LvpHub.StateMethod, snapshot);
                }
            }
            catch (Exception ex)
            {
                logger.LogWarning(ex, "Hub broadcast of snapshot {Version} failed", snapshot.Version);
            }
        });
        return Task.CompletedTask;
    }

    public Task StopAsync(CancellationToken cancellationToken)
    {
        _subscription?.Dispose();
        return Task.CompletedTask;
    }
}
