using Microsoft.Extensions.Options;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Anchors;

/// <summary>
/// Signs the audit chain's head and appends it to the anchor log and the server log: every
/// <see cref="AnchorOptions.Interval"/> of real time, at shutdown and on demand (docs/audit.md "Anchors").
/// Registered before the engine host, so it stops after it and the shutdown anchor covers the engine's last entries.
/// </summary>
public sealed class AnchorService(
    AuditStore audit,
    AnchorKey key,
    AnchorLog log,
    IOptions<AnchorOptions> options,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
    ILogger<AnchorService> logger) : BackgroundService
{
    // Never disposed: a SemaphoreSlim whose wait handle is never asked for holds nothing to free, and a host that is
    // stopped after its services were disposed (a test fixture's double stop) must still reach the shutdown anchor.
    private readonly SemaphoreSlim _gate = new(1, 1);
    private bool _resetPending;
    // The shutdown anchor, written once. A second StopAsync (the generic host's own run loop stops the host again when
    // a test host or a service stops it) waits for the first one's anchor: returning at once let that caller go on to
    // dispose the host, and with it the key and the logger, while the anchor was still being written.
    private Task? _shutdownAnchor;

    /// <summary>The next anchor starts afresh (after an administrator acknowledged a mismatch).</summary>
    public void RequestReset() => _resetPending = true;

    /// <summary>Signs the current head now and writes it out; returns the anchor.</summary>
    public async Task<AuditAnchor> AnchorNowAsync(string why, CancellationToken cancellationToken = default)
    {
        await _gate.WaitAsync(cancellationToken);
        try
        {
            var head = await audit.GetHeadAsync(cancellationToken);
            var reset = _resetPending;
            var anchor = AuditAnchor.Sign(key.Key, head?.Sequence ?? 0, head?.Hash ?? AuditChain.GenesisHash, realClock.GetUtcNow(), reset);
            log.Append(anchor);
            _resetPending = false;
            logger.LogInformation("Audit anchor ({Why}): {Anchor}", why, anchor.ToJsonLine());
            return anchor;
        }
        finally
        {
            _gate.Release();
        }
    }

    public override async Task StopAsync(CancellationToken cancellationToken)
    {
        try
        {
            // throws when the host's shutdown time runs out before the interval loop ends: the anchor is still written
            await base.StopAsync(cancellationToken);
        }
        finally
        {
            var mine = new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously);
            if (Interlocked.CompareExchange(ref _shutdownAnchor, mine.Task, null) is { } first)
            {
                await first;
            }
            else
            {
                try
                {
                    await TryAnchorAsync("shutdown", CancellationToken.None);
                }
                finally
                {
                    mine.SetResult();
                }
            }
        }
    }

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(options.Value.Interval, realClock);
        try
        {
            while (await timer.WaitForNextTickAsync(stoppingToken))
            {
                await TryAnchorAsync("interval", stoppingToken);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private async Task TryAnchorAsync(string why, CancellationToken cancellationToken)
    {
        try
        {
            await AnchorNowAsync(why, cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
        {
            logger.LogError(ex, "Audit anchor ({Why}) could not be written to {Path}", why, log.Path);
        }
    }
}
