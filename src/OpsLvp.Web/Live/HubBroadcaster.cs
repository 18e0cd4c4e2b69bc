using Microsoft.AspNetCore.SignalR;

namespace OpsLvp.Web.Live;

/// <summary>Sends every published snapshot to all hub clients (a subscriber of <see cref="ILiveState"/>).</summary>
public sealed class HubBroadcaster(ILiveState live, IHubContext<LvpHub> hub, ILogger<HubBroadcaster> logger) : IHostedService
{
    private IDisposable? _subscription;

    public Task StartAsync(CancellationToken cancellationToken)
    {
        _subscription = live.Subscribe(async snapshot =>
        {
            try
            {
                await hub.Clients.All.SendAsync(LvpHub.StateMethod, snapshot);
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
