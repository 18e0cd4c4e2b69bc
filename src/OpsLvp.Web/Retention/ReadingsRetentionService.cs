using System.Text.Json;
using Microsoft.Extensions.Options;
using OpsLvp.Data.Retention;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Retention;

/// <summary>
/// Runs <see cref="ReadingsPruner"/> every <see cref="RetentionOptions.Interval"/> (real time, the network clock) on the
/// node that leads (docs/retention.md). The cutoff is in the app's clock (demo time in demo mode), like the readings'
/// receipt times. A failed run deletes nothing (or only what its committed audit entry names) and is logged as an error
/// with its reason; it also raises the on-screen <see cref="RetentionAlarm"/> (with an audit entry), which the next
/// successful run clears (docs/engine.md R78). The next run tries again.
/// <para>Leadership (docs/engine.md R86): a node that wins leadership runs at once instead of at the end of its current
/// interval, so a prune that still fails is an alarm again right after a failover; a node that loses leadership takes its
/// alarm down (logged; not audited, as a node that does not lead writes nothing) and leaves it to the new leader's run.</para>
/// <para>Fencing (docs/engine.md R71): the run's entries (<c>readings_pruned</c>, <c>retention_alarm_raised</c>,
/// <c>retention_alarm_cleared</c>) carry the leadership epoch read when the run starts and go through the engine's fenced
/// append, so on PostgreSQL a run that outlives its node's leadership writes nothing (and deletes nothing): the alarm is
/// taken down here and the node steps down, as after a refused engine append. One node on SQLite: unfenced, as before.
/// The acknowledgement is a command, so it is the engine's own fenced commit on the leader (forwarded there from a
/// standby).</para>
/// </summary>
public sealed class ReadingsRetentionService(
    ReadingsPruner pruner,
    AuditStore audit,
    IOptions<RetentionOptions> options,
    RetentionFolder folder,
    ILeadership leadership,
    RetentionAlarm alarm,
    TimeProvider time,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
    ILogger<ReadingsRetentionService> logger) : BackgroundService
{
    private TaskCompletionSource _wake = new(TaskCreationOptions.RunContinuationsAsynchronously);

    /// <summary>The outcome of the last run, or null before the first.</summary>
    public PruneOutcome? LastOutcome { get; private set; }

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        var o = options.Value;
        if (o.ReadingsDays <= 0)
        {
            return;
        }
        logger.LogInformation("Readings retention: readings older than {Days} day(s) are exported to {Folder} and pruned every {Interval}", o.ReadingsDays, folder.Path, o.Interval);
        leadership.LeadershipChanged += OnLeadershipChanged;
        try
        {
            while (!stoppingToken.IsCancellationRequested)
            {
                var wake = Volatile.Read(ref _wake);
                if (wake.Task.IsCompleted)
                {
                    // this wake is being served by the run below; a later one wakes the next sleep
                    Interlocked.CompareExchange(ref _wake, new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously), wake);
                }
                long epoch = 0;
                try
                {
                    if (leadership.IsLeader)
                    {
                        // read at the start of the run, after the check: every entry of the run carries it (see RunAsync)
                        epoch = leadership.Epoch;
                        await RunAsync(epoch, stoppingToken);
                    }
                }
                catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
                {
                    return;
                }
                catch (Exception ex)
                {
                    logger.LogError(ex, "Readings retention run failed; nothing of it was deleted unless its audit entry was committed");
                    await RaiseAsync($"readings not pruned: the run failed: {ex.Message.ReplaceLineEndings(" ")}", epoch, stoppingToken);
                }
                await SleepAsync(o.Interval, stoppingToken);
            }
        }
        finally
        {
            leadership.LeadershipChanged -= OnLeadershipChanged;
        }
    }

    private void OnLeadershipChanged(bool leader)
    {
        if (!leader && alarm.Clear() is { } was)
        {
            logger.LogWarning("Readings retention alarm taken down on this node: it no longer leads (raised at {RaisedAt}: {Message}); the leader's next run raises it again if pruning still fails", was.RaisedAt, was.Message);
        }
        // a new leader prunes now; a node that stepped down wakes only to find it does not lead
        Volatile.Read(ref _wake).TrySetResult();
    }

    /// <summary>Waits <paramref name="interval"/> on the real clock, or until leadership changes.</summary>
    private async Task SleepAsync(TimeSpan interval, CancellationToken stoppingToken)
    {
        using var cancel = CancellationTokenSource.CreateLinkedTokenSource(stoppingToken);
        var delay = Task.Delay(interval, realClock, cancel.Token);
        await Task.WhenAny(delay, Volatile.Read(ref _wake).Task);
        await cancel.CancelAsync(); // the timer of a delay cut short by a wake
    }

    /// <summary>One pruning run now, with this node's leadership epoch as it is now (also used by tests).</summary>
    public Task<PruneOutcome> RunOnceAsync(CancellationToken cancellationToken) => RunAsync(leadership.Epoch, cancellationToken);

    /// <summary>
    /// One pruning run whose entries carry <paramref name="epoch"/>, read before the run started. A node that does not
    /// lead has 0, never the epoch on record once a node has led, so such a run's entries are refused on PostgreSQL;
    /// SQLite (one node) does not check it.
    /// </summary>
    private async Task<PruneOutcome> RunAsync(long epoch, CancellationToken cancellationToken)
    {
        var o = options.Value;
        DateTimeOffset? episodeStart;
        try
        {
            var persisted = await audit.GetLatestStateAsync(cancellationToken);
            episodeStart = persisted is null ? null : EngineStateJson.Deserialize(persisted.StateJson).Episode?.Start;
        }
        catch (JsonException ex)
        {
            LastOutcome = new PruneOutcome(null, null, 0, $"readings not pruned: the stored engine state cannot be read to find an open episode: {ex.Message}");
            logger.LogError("{Failure}", LastOutcome.Failure);
            await RaiseAsync(LastOutcome.Failure!, epoch, cancellationToken);
            return LastOutcome;
        }
        if (RetentionCutoff.Compute(time.GetUtcNow(), o.ReadingsDays, episodeStart) is not { } cutoff)
        {
            return LastOutcome = new PruneOutcome(null, null, 0, null);
        }
        var outcome = await pruner.RunAsync(new PruneRequest(cutoff, folder.Path, o.BatchSize, o.MaxReadingsPerRun, epoch), cancellationToken);
        LastOutcome = outcome;
        if (outcome.Failed)
        {
            logger.LogError("Readings retention: {Failure}", outcome.Failure);
            await RaiseAsync(outcome.Failure!, epoch, cancellationToken);
            return outcome;
        }
        await ClearAsync(epoch, cancellationToken);
        if (outcome.Pruned is { } p)
        {
            logger.LogInformation("Readings retention: pruned {Count} reading(s) with id {First}–{Last} received before {Cutoff} into {Files} export file(s); audit entry {Sequence}",
                p.Count, p.After + 1, p.To, p.Cutoff, p.Files.Count, outcome.AuditSequence);
        }
        return outcome;
    }

    private async Task RaiseAsync(string failure, long epoch, CancellationToken cancellationToken)
    {
        if (!leadership.IsLeader)
        {
            // leadership was lost during the run: the new leader's own run raises the alarm if pruning still fails
            logger.LogWarning("Readings retention alarm not raised on this node: it no longer leads ({Failure})", failure);
            return;
        }
        var now = time.GetUtcNow();
        if (!alarm.Raise(failure, now))
        {
            return;
        }
        logger.LogError("Readings retention alarm raised on screen: {Failure}", failure);
        await RecordAsync(AuditEvents.RetentionAlarmRaised, new { key = RetentionAlarm.Key, message = alarm.Current?.Message ?? failure }, now, epoch, cancellationToken);
    }

    private async Task ClearAsync(long epoch, CancellationToken cancellationToken)
    {
        if (alarm.Clear() is not { } was)
        {
            return;
        }
        var now = time.GetUtcNow();
        logger.LogWarning("Readings retention works again: alarm cleared (it was raised at {RaisedAt}: {Message})", was.RaisedAt, was.Message);
        await RecordAsync(AuditEvents.RetentionAlarmCleared, new { key = RetentionAlarm.Key, message = was.Message, raisedAt = was.RaisedAt }, now, epoch, cancellationToken);
    }

    /// <summary>
    /// The alarm's audit entry, like the prune's own: appended without engine state, fenced by the run's
    /// <paramref name="epoch"/> (docs/engine.md R71). A failure to record it is logged; the alarm stays on screen
    /// regardless, unless the epoch is stale: then this node does not lead, takes the alarm down and steps down.
    /// </summary>
    private async Task RecordAsync(string kind, object payload, DateTimeOffset now, long epoch, CancellationToken cancellationToken)
    {
        try
        {
            await audit.AppendFencedAsync([AuditEvents.HostEntry(kind, now, payload)], null, epoch, cancellationToken);
        }
        catch (StaleEpochException ex)
        {
            alarm.Clear();
            logger.LogWarning("Readings retention: the audit entry {Kind} was not recorded: {Reason}; the alarm is taken down on this node, which steps down (the leader's next run raises it again if pruning still fails)", kind, ex.Message);
            if (leadership.Epoch == epoch)
            {
                // it still holds the refused epoch: stale, as after a refused engine append (a node that has since won
                // again holds a newer one and stays)
                (leadership as ILeadershipElection)?.StepDown(ex.Message);
            }
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            logger.LogError(ex, "Readings retention: the audit entry {Kind} could not be recorded", kind);
        }
    }
}
