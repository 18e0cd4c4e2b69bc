using System.Collections.Concurrent;
using Microsoft.AspNetCore.SignalR;
using Microsoft.Extensions.Options;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Access;

/// <summary>
/// Keeps the open hub connections and, every <see cref="AccessOptions.RevalidationInterval"/> (real time), aborts
/// those whose principal is no longer valid (<see cref="AccessValidator"/>): a removed role, a disabled user, a
/// revoked display token or API key.
/// </summary>
public sealed class HubConnectionMonitor(
    AccessValidator validator,
    IOptions<AccessOptions> options,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
    ILogger<HubConnectionMonitor> logger) : BackgroundService
{
    private readonly ConcurrentDictionary<string, HubCallerContext> _connections = new(StringComparer.Ordinal);

    public int Count => _connections.Count;

    public void Add(HubCallerContext context) => _connections[context.ConnectionId] = context;

    public void Remove(HubCallerContext context) => _connections.TryRemove(context.ConnectionId, out _);

    /// <summary>Checks every connection once now.</summary>
    public async Task SweepAsync(CancellationToken cancellationToken)
    {
        foreach (var (id, context) in _connections)
        {
            if (context.User is { } user && !await validator.IsStillValidAsync(user, cancellationToken))
            {
                logger.LogInformation("Hub connection {Connection} of {User} ended: access revoked", id, user.Identity?.Name);
                _connections.TryRemove(id, out _);
                context.Abort();
            }
        }
    }

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(options.Value.RevalidationInterval, realClock);
        try
        {
            while (await timer.WaitForNextTickAsync(stoppingToken))
            {
                try
                {
                    await SweepAsync(stoppingToken);
                }
                catch (Exception ex) when (ex is not OperationCanceledException)
                {
                    logger.LogError(ex, "Hub access sweep failed; retrying at the next interval");
                }
            }
        }
        catch (OperationCanceledException)
        {
        }
    }
}
