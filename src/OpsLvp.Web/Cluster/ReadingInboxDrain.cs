using System.Text;
using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Options;
using Npgsql;
using OpsLvp.Core.Readings;
using OpsLvp.Data;
using OpsLvp.Data.Entities;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// The leader's side of the reading inbox (docs/deployment.md "Readings from any node"; docs/engine.md R73–R75). Every
/// node on PostgreSQL keeps one dedicated connection that <c>LISTEN</c>s on <see cref="ReadingInboxStore.NotifyChannel"/>;
/// while the node leads, a notification, its winning leadership, or at the latest every <c>Cluster:InboxPollInterval</c>
/// (so a lost notification only delays) makes it read the inbox from its oldest row and evaluate up to
/// <see cref="MaxBatchesPerEvaluation"/> batches at a time, in id order, through the engine host's single evaluation
/// path. Their readings are stored in the transaction that deletes their rows, so a batch is taken exactly once;
/// a batch that is not taken (not recording, leadership lost) stays at the head of the queue and nothing after it
/// goes first. Idle on SQLite.
/// </summary>
public sealed class ReadingInboxDrain(
    ReadingInboxStore inbox,
    LiveEngineHost engine,
    ILeadership leadership,
    FeedHealthRegistry feeds,
    IDbContextFactory<OpsLvpDbContext> dbFactory,
    IOptions<ClusterOptions> options,
    TimeProvider clock,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
    ILogger<ReadingInboxDrain> logger) : BackgroundService
{
    /// <summary>Inbox batches evaluated together at most (one readings transaction, one commit).</summary>
    public const int MaxBatchesPerEvaluation = 64;

    /// <summary>The <c>application_name</c> prefix of the listening connection (followed by the node id).</summary>
    public const string ApplicationNamePrefix = "opslvp-inbox:";

    private static readonly TimeSpan s_reconnectDelay = TimeSpan.FromSeconds(2);

    private static readonly TimeSpan s_waitingWarnAfter = TimeSpan.FromSeconds(30);

    private readonly SemaphoreSlim _wake = new(0, 1);
    private DateTimeOffset _lastWaitingWarning;

    /// <summary>Batches taken from the inbox by this node since its start.</summary>
    public long Drained { get; private set; }

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        if (!engine.IsEnabled || !inbox.IsAvailable)
        {
            return;
        }
        leadership.LeadershipChanged += OnLeadershipChanged;
        try
        {
            await Task.WhenAll(ListenAsync(stoppingToken), DrainLoopAsync(stoppingToken));
        }
        finally
        {
            leadership.LeadershipChanged -= OnLeadershipChanged;
        }
    }

    private void OnLeadershipChanged(bool leader)
    {
        if (leader)
        {
            // a new leader drains what its predecessor left right after its restore (the evaluation restores first)
            Wake();
        }
    }

    private void Wake()
    {
        try
        {
            _wake.Release();
        }
        catch (SemaphoreFullException)
        {
            // a wake is already pending
        }
        catch (ObjectDisposedException)
        {
        }
    }

    private async Task DrainLoopAsync(CancellationToken stoppingToken)
    {
        await Task.Yield();
        var interval = options.Value.InboxPollInterval;
        while (!stoppingToken.IsCancellationRequested)
        {
            var more = false;
            try
            {
                if (leadership.IsLeader && engine.Health.Stopped is null)
                {
                    more = await DrainOnceAsync(stoppingToken);
                }
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex)
            {
                logger.LogWarning("Reading inbox not drained: {Error}; trying again within {Interval}", EngineRecorder.Describe(ex), interval);
            }
            if (!more)
            {
                try
                {
                    await _wake.WaitAsync(interval, stoppingToken);
                }
                catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
                {
                    return;
                }
            }
        }
    }

    /// <summary>Evaluates the oldest waiting batches; true when they were taken (there may be more).</summary>
    private async Task<bool> DrainOnceAsync(CancellationToken cancellationToken)
    {
        var rows = await inbox.PeekAsync(MaxBatchesPerEvaluation, cancellationToken);
        if (rows.Count == 0)
        {
            return false;
        }
        var batches = rows.Select(ToBatch).ToList();
        var outcome = await engine.EvaluateInboxAsync(batches, cancellationToken);
        if (!outcome.Committed)
        {
            // the age on the app clock the standby stamped it with; the warning's rate on the real clock
            var realNow = realClock.GetUtcNow();
            if (clock.GetUtcNow() - rows[0].ReceivedAt > s_waitingWarnAfter && realNow - _lastWaitingWarning > s_waitingWarnAfter)
            {
                _lastWaitingWarning = realNow;
                logger.LogWarning("Reading inbox: {Batches} batch(es) or more wait, the oldest received {Oldest:o} on {Node}: {Reason}",
                    rows.Count, rows[0].ReceivedAt, rows[0].NodeId, outcome.Error);
            }
            return false;
        }
        foreach (var row in rows)
        {
            // the feed's health as if it had pushed to this node (it did push, to another)
            feeds.RecordSuccess(row.Source, row.Accepted, row.Rejected);
        }
        Drained += rows.Count;
        logger.LogDebug("Reading inbox: {Batches} batch(es) taken, ids {First} to {Last}", rows.Count, rows[0].Id, rows[^1].Id);
        return true;
    }

    /// <summary>
    /// The batch as the standby parsed it, with the same parser (no item limit: the standby applied its own). A row that
    /// cannot be read any more becomes one rejection with the reason, so it is recorded and leaves the queue instead of
    /// blocking it.
    /// </summary>
    private ReadingBatch ToBatch(ReadingInboxRow row)
    {
        try
        {
            return ReadingJsonParser.Parse(Encoding.UTF8.GetBytes(row.Body), int.MaxValue).ToBatch(row.Source, row.ReceivedAt) with { InboxId = row.Id };
        }
        catch (FeedFormatException ex)
        {
            logger.LogError("Reading inbox row {Id} from {Node} cannot be read: {Error}; recorded as rejected", row.Id, row.NodeId, ex.Message);
            return new ReadingBatch(row.Source, row.ReceivedAt, [], [new ReadingRejection(0, RejectReason.Malformed, $"inbox row {row.Id} cannot be read: {ex.Message}")])
            {
                InboxId = row.Id,
            };
        }
    }

    /// <summary>Keeps the listening connection open, reconnecting after a failure; notifications wake the drain.</summary>
    private async Task ListenAsync(CancellationToken stoppingToken)
    {
        await Task.Yield();
        var lostLogged = false;
        while (!stoppingToken.IsCancellationRequested)
        {
            try
            {
                await using var connection = await OpenAsync(stoppingToken);
                connection.Notification += (_, _) => Wake();
                await using (var listen = new NpgsqlCommand("LISTEN " + ReadingInboxStore.NotifyChannel, connection))
                {
                    await listen.ExecuteNonQueryAsync(stoppingToken);
                }
                if (lostLogged)
                {
                    logger.LogInformation("Reading inbox: listening again on {Channel}", ReadingInboxStore.NotifyChannel);
                    lostLogged = false;
                }
                // whatever was queued while nobody listened
                Wake();
                while (!stoppingToken.IsCancellationRequested)
                {
                    await connection.WaitAsync(stoppingToken);
                }
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex)
            {
                if (!lostLogged)
                {
                    logger.LogWarning("Reading inbox: not listening on {Channel}: {Error}; polling every {Interval} until it is back",
                        ReadingInboxStore.NotifyChannel, EngineRecorder.Describe(ex), options.Value.InboxPollInterval);
                    lostLogged = true;
                }
            }
            try
            {
                await Task.Delay(s_reconnectDelay, realClock, stoppingToken);
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
        }
    }

    // a dedicated session for LISTEN, kept alive; not from the pool
    private Task<NpgsqlConnection> OpenAsync(CancellationToken cancellationToken) =>
        DedicatedSession.OpenAsync(dbFactory, b =>
        {
            b.KeepAlive = 5;
            b.TcpKeepAlive = true;
            b.ApplicationName = ApplicationNamePrefix + leadership.NodeId;
        }, cancellationToken);

    public override void Dispose()
    {
        _wake.Dispose();
        base.Dispose();
    }
}
