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
/// goes first. An evaluation that throws is tried again batch by batch; a head batch that still throws after
/// <c>Cluster:InboxSetAsideAfter</c> attempts is set aside with an audit entry and an alarm (R82), so the batches after it
/// flow; the attempts are counted on the batch's row, so a new leader goes on from its predecessor's count. While the
/// head waits longer than <c>Cluster:InboxAlarmAfter</c> the screens show <c>inbox-behind</c> (R81). Idle on SQLite.
/// </summary>
public sealed class ReadingInboxDrain(
    ReadingInboxStore inbox,
    LiveEngineHost engine,
    ILeadership leadership,
    FeedHealthRegistry feeds,
    InboxAlarms alarms,
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

    /// <summary>The longest error text and body excerpt an <c>inbox_batch_set_aside</c> entry keeps (characters).</summary>
    public const int SetAsideErrorChars = 1000;

    /// <inheritdoc cref="SetAsideErrorChars"/>
    public const int SetAsideBodyChars = 4096;

    private readonly SemaphoreSlim _wake = new(0, 1);
    private DateTimeOffset _lastWaitingWarning;
    private DateTimeOffset _lastNotDrainedWarning = DateTimeOffset.MinValue;
    private int _notDrainedSinceWarning;
    // batches up to this id are evaluated one at a time (an evaluation of several threw: find the one that fails)
    private long _aloneThrough;

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
                else
                {
                    // only the leader's screens show the alarm; a node that stepped down forgets it
                    alarms.NotBehind();
                }
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex)
            {
                NotDrained(ex, interval);
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

    /// <summary>The inbox could not be read: a warning at most every 30 s, with how many attempts failed meanwhile.</summary>
    private void NotDrained(Exception ex, TimeSpan interval)
    {
        _notDrainedSinceWarning++;
        var realNow = realClock.GetUtcNow();
        if (realNow - _lastNotDrainedWarning < s_waitingWarnAfter)
        {
            return;
        }
        logger.LogWarning("Reading inbox not drained: {Error}; trying again every {Interval} ({Failures} failed attempt(s) since the last warning, next warning in {Every} s at the earliest)",
            EngineRecorder.Describe(ex), interval, _notDrainedSinceWarning, s_waitingWarnAfter.TotalSeconds);
        _notDrainedSinceWarning = 0;
        _lastNotDrainedWarning = realNow;
    }

    /// <summary>Evaluates the oldest waiting batches; true when they were taken or set aside (there may be more).</summary>
    private async Task<bool> DrainOnceAsync(CancellationToken cancellationToken)
    {
        var rows = await inbox.PeekAsync(MaxBatchesPerEvaluation, cancellationToken);
        if (rows.Count == 0)
        {
            alarms.NotBehind();
            return false;
        }
        await ShowAgeAsync(rows[0], cancellationToken);
        if (rows[0].Id <= _aloneThrough)
        {
            rows = [rows[0]];
        }
        var batches = rows.Select(ToBatch).ToList();
        EvaluationOutcome outcome;
        try
        {
            outcome = await engine.EvaluateInboxAsync(batches, cancellationToken);
        }
        catch (Exception ex) when ((ex is not OperationCanceledException || !cancellationToken.IsCancellationRequested) && !IsInfrastructure(ex))
        {
            // a database or network failure (a restore that could not read, a connection lost) is not the batch's
            // fault: it goes to the throttled "not drained" warning and counts no attempt
            return await FailedAsync(rows, ex, cancellationToken);
        }
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
    /// While the head batch has waited longer than <c>Cluster:InboxAlarmAfter</c> (the standby's stamp on the app
    /// clock), the <c>inbox-behind</c> alarm names how many wait and since when (docs/engine.md R81); else it is cleared.
    /// </summary>
    private async Task ShowAgeAsync(ReadingInboxRow head, CancellationToken cancellationToken)
    {
        var now = clock.GetUtcNow();
        if (now - head.ReceivedAt <= options.Value.InboxAlarmAfter)
        {
            alarms.NotBehind();
            return;
        }
        var (waiting, _) = await inbox.WaitingAsync(cancellationToken);
        alarms.Behind(Math.Max(waiting, 1), head.ReceivedAt, head.NodeId, now);
    }

    /// <summary>
    /// True when <paramref name="ex"/> is the database or the network failing rather than the batch: a
    /// <see cref="System.Data.Common.DbException"/> (other than the data or integrity errors the evaluation reports as
    /// <see cref="InboxBatchFaultException"/>), a timeout, or an I/O or socket error, anywhere in it.
    /// </summary>
    internal static bool IsInfrastructure(Exception ex)
    {
        if (ex is InboxBatchFaultException)
        {
            return false;
        }
        for (var e = ex; e is not null; e = e.InnerException)
        {
            if (e is System.Data.Common.DbException or TimeoutException or IOException or System.Net.Sockets.SocketException)
            {
                return true;
            }
        }
        return false;
    }

    /// <summary>
    /// The evaluation of <paramref name="rows"/> threw (not "not recording", not "leadership lost": those come back as
    /// not committed). Several batches: they are tried one at a time from now on, to find the one that fails. One batch:
    /// another attempt, and after <c>Cluster:InboxSetAsideAfter</c> of them it is set aside (docs/engine.md R82). The
    /// attempt and its error are recorded on the batch's row (fenced by this node's epoch), and the count read back is
    /// every leader's: a failover does not start it again. True when the drain should go on at once.
    /// </summary>
    private async Task<bool> FailedAsync(IReadOnlyList<ReadingInboxRow> rows, Exception ex, CancellationToken cancellationToken)
    {
        var error = EngineRecorder.Describe(ex);
        if (rows.Count > 1)
        {
            _aloneThrough = Math.Max(_aloneThrough, rows[^1].Id);
            logger.LogWarning("Reading inbox: batches {First} to {Last} failed together ({Error}); trying them one at a time", rows[0].Id, rows[^1].Id, error);
            return true;
        }
        var row = rows[0];
        int attempts;
        try
        {
            if (await inbox.RecordFailedAttemptAsync(row.Id, Clip(error, SetAsideErrorChars), leadership.Epoch, cancellationToken) is not { } counted)
            {
                logger.LogWarning("Reading inbox: batch {Id} failed here ({Error}) but was already taken by another node", row.Id, error);
                return true;
            }
            attempts = counted;
        }
        catch (StaleEpochException stale)
        {
            // another node leads: its own attempts count, this one does not
            logger.LogWarning("Reading inbox: batch {Id} failed here ({Error}); attempt not counted: {Reason}", row.Id, error, stale.Message);
            return false;
        }
        var limit = options.Value.InboxSetAsideAfter;
        if (attempts < limit)
        {
            logger.LogWarning("Reading inbox: batch {Id} from {Node} failed (attempt {Attempt} of {Limit}): {Error}; trying again within {Interval}",
                row.Id, row.NodeId, attempts, limit, error, options.Value.InboxPollInterval);
            return false;
        }
        return await SetAsideAsync(row, error, attempts, cancellationToken);
    }

    /// <summary>
    /// Sets <paramref name="row"/> aside (docs/engine.md R82): its <c>inbox_batch_set_aside</c> audit entry (batch id,
    /// node, received time, reading count, the error and the body, each bounded) and the row's removal in one fenced
    /// commit; then the alarm. Not committed: the row stays at the head and is tried again.
    /// </summary>
    private async Task<bool> SetAsideAsync(ReadingInboxRow row, string error, int attempts, CancellationToken cancellationToken)
    {
        var now = clock.GetUtcNow();
        var bodyBytes = Encoding.UTF8.GetBytes(row.Body);
        var entry = AuditEvents.HostEntry(AuditEvents.InboxBatchSetAside, now, new
        {
            inboxId = row.Id,
            node = row.NodeId,
            receivedAt = row.ReceivedAt,
            source = row.Source,
            readings = row.Accepted + row.Rejected,
            accepted = row.Accepted,
            rejected = row.Rejected,
            attempts,
            error = Clip(error, SetAsideErrorChars),
            bodyBytes = bodyBytes.Length,
            bodySha256 = Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(bodyBytes)),
            body = Clip(row.Body, SetAsideBodyChars),
        });
        EvaluationOutcome outcome;
        try
        {
            outcome = await engine.SetAsideInboxAsync(entry, row.Id, cancellationToken);
        }
        catch (InboxClaimLostException)
        {
            logger.LogWarning("Reading inbox: batch {Id} was already taken by another node; not set aside", row.Id);
            return true;
        }
        if (!outcome.Committed)
        {
            logger.LogWarning("Reading inbox: batch {Id} not set aside: {Reason}; it stays at the head", row.Id, outcome.Error);
            return false;
        }
        SetAsideCount++;
        alarms.SetAside(row.Id, row.NodeId, row.ReceivedAt, row.Accepted + row.Rejected, Clip(error, 200), now);
        logger.LogError("Reading inbox: batch {Id} received {ReceivedAt:o} on {Node} from {Source} ({Readings} item(s)) set aside after {Attempts} failed attempt(s): {Error}; its readings are not evaluated (audit entry {Kind})",
            row.Id, row.ReceivedAt, row.NodeId, row.Source, row.Accepted + row.Rejected, attempts, error, AuditEvents.InboxBatchSetAside);
        return true;
    }

    private static string Clip(string text, int max)
    {
        if (text.Length <= max)
        {
            return text;
        }
        var cut = char.IsHighSurrogate(text[max - 1]) ? max - 1 : max;
        return text[..cut] + $"... ({text.Length} characters)";
    }

    /// <summary>Batches this node set aside since its start (docs/engine.md R82).</summary>
    public long SetAsideCount { get; private set; }

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
            // as the leadership session's: a dead connection (a cut network, a database host gone) is noticed within
            // seconds instead of the operating system's two hours, and the node falls back to polling while it reconnects
            b.TcpKeepAlive = true;
            b.TcpKeepAliveTime = 2;
            b.TcpKeepAliveInterval = 1;
            b.ApplicationName = ApplicationNamePrefix + leadership.NodeId;
        }, cancellationToken);

    public override void Dispose()
    {
        _wake.Dispose();
        base.Dispose();
    }
}
