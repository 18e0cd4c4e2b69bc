using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Anchors;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Live;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Engine;

/// <summary>
/// The live heart of the server (DEVELOPERS.md "Data flow"; docs/engine.md R7, R12), a coordinator of its parts:
/// <see cref="EngineStartup"/> (migrate, profile, restore the persisted state), <see cref="EvaluationLoop"/> (reading
/// batches and the tick), <see cref="EngineEvaluator"/> (one evaluation: pure engine, then commit, then publish),
/// <see cref="EngineRecorder"/> (readings, audit entries and the state row in one commit; not recording) and
/// <see cref="EnginePublisher"/> (numbered snapshots to <see cref="LiveState"/>). One evaluation runs at a time.
/// <para>Leadership (<see cref="ILeadership"/>; docs/engine.md R70–R72): only the leader evaluates. On one node it
/// always leads. With several nodes on PostgreSQL a node that takes leadership restores the state from the database
/// and starts evaluating with the new epoch, whose appends are fenced; a node that loses it (or whose append is
/// refused as stale) stops evaluating at once and is a standby: batches reaching its evaluation path are refused, not
/// acknowledged (pushes to it go to the reading inbox instead, R73), and its ticks evaluate nothing.</para>
/// </summary>
public sealed class LiveEngineHost(
    IOptions<EngineOptions> options,
    ContentPaths paths,
    IDbContextFactory<OpsLvpDbContext> dbFactory,
    AuditStore audit,
    ReadingStore readingStore,
    ReadingPipeline pipeline,
    FeedHealthRegistry feeds,
    IOptions<FeedsOptions> feedsOptions,
    LiveState live,
    DemoMode demo,
    TimeProvider clock,
    [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
    ILogger<LiveEngineHost> logger,
    ILoggerFactory loggerFactory,
    TamperCheck tamper,
    ILeadership leadership,
    OpsLvp.Web.Retention.RetentionAlarm retentionAlarm,
    InboxAlarms inboxAlarms) : BackgroundService, IEngineStateView
{
    /// <summary>The reason a standby gives for readings and commands it does not evaluate.</summary>
    public const string StandbyText = "this node is a standby: the engine runs on the leader node";

    private readonly SemaphoreSlim _gate = new(1, 1);
    private readonly EngineStartup _startup = new(options, paths, dbFactory, audit, readingStore, tamper, logger);
    private readonly EngineRecorder _recorder = new(audit, readingStore, options.Value.StateFlushInterval, options.Value.ReadingsCoverInterval, logger);
    private readonly EnginePublisher _publisher = new(live, feeds, demo);
    private readonly FeedHealthJournal _feedJournal = new(feedsOptions.Value.HealthAuditInterval);
    private readonly CancellationTokenSource _stopping = new();
    private CancellationTokenRegistration _stoppingRegistration;
    private volatile EngineEvaluator? _evaluator;
    private long _runEpoch;
    private AerodromeProfile? _profile;
    private string? _switchedFrom;
    private string? _stopped;

    /// <summary>
    /// The loaded profile while the host runs and is not stopped, leading or not: a node that has just won leadership
    /// still restoring, or a standby, screens commands against it and lets the evaluation path decide (restore first, or
    /// "this node is a standby"), instead of answering "not running" from a race.
    /// </summary>
    public AerodromeProfile? Profile => _stopped is null ? _profile : null;

    /// <summary>The current (committed) state; null before start.</summary>
    public EngineState? State => _evaluator?.State;

    public bool WillEvaluate => options.Value.Enabled && _stopped is null;

    public EngineHealth Health => new(
        _evaluator is not null,
        _evaluator?.LastEvaluationAt,
        _recorder.Error is null ? "ok" : "failing",
        _recorder.Error,
        Profile?.Version,
        _recorder.FailingSince,
        _stopped);

    /// <summary>This node runs the host but another node leads the engine (docs/engine.md R70): it stores and evaluates nothing.</summary>
    /// <summary>The host runs (<c>Engine:Enabled</c> and the profile loaded), leading or not: readings pushed to it are answered only once stored or refused.</summary>
    public bool IsEnabled => _profile is not null;

    public bool IsStandby => _profile is not null && _stopped is null && !leadership.IsLeader;

    /// <summary>Recording or not, and since when (docs/reliability.md "Storage faults").</summary>
    public RecordingView Recording => _recorder.Recording;

    public override async Task StartAsync(CancellationToken cancellationToken)
    {
        if (!options.Value.Enabled)
        {
            logger.LogWarning("Engine host disabled (Engine:Enabled=false): no evaluation, no live state");
            return;
        }
        _switchedFrom = await _startup.MigrateAsync(cancellationToken);
        _profile = _startup.LoadProfile();
        leadership.LeadershipChanged += OnLeadershipChanged;
        if (leadership is ILeadershipElection election)
        {
            // one attempt now, so a lone node (or the first of several) leads from its start
            await election.TryAcquireAsync(cancellationToken);
        }
        if (leadership.IsLeader)
        {
            await _gate.WaitAsync(cancellationToken);
            try
            {
                await TakeOverLockedAsync(cancellationToken);
            }
            finally
            {
                _gate.Release();
            }
            if (_stopped is not null)
            {
                return;
            }
        }
        else
        {
            logger.LogWarning("Node {Node} starts as a standby: another node leads the engine", leadership.NodeId);
        }
        await base.StartAsync(cancellationToken);
    }

    /// <summary>Evaluates one command through the single evaluation path (used by the command service).</summary>
    public Task<EvaluationOutcome> ExecuteAsync(EngineCommand command, CancellationToken cancellationToken = default) =>
        EvaluateAsync([], command, [], cancellationToken);

    /// <summary>
    /// Evaluates reading batches taken from the reading inbox (pushed to a standby; docs/engine.md R74) through the
    /// single evaluation path, as one evaluation: stored in one transaction that also removes their inbox rows, or not at all.
    /// </summary>
    public Task<EvaluationOutcome> EvaluateInboxAsync(IReadOnlyList<ReadingBatch> batches, CancellationToken cancellationToken = default) =>
        EvaluateAsync(batches, null, [], cancellationToken);

    /// <summary>
    /// Sets a failing inbox batch aside (docs/engine.md R82): one evaluation whose commit appends <paramref name="entry"/>
    /// and deletes the inbox row <paramref name="inboxId"/> together, fenced like every engine append; nothing of the
    /// batch is evaluated. Not committed (not recording, leadership lost): the row stays.
    /// </summary>
    /// <exception cref="InboxClaimLostException">The row is gone (another node took it): nothing was written.</exception>
    public Task<EvaluationOutcome> SetAsideInboxAsync(NewAuditEntry entry, long inboxId, CancellationToken cancellationToken = default) =>
        EvaluateAsync([], null, [entry], cancellationToken, [inboxId]);

    protected override Task ExecuteAsync(CancellationToken stoppingToken)
    {
        _stoppingRegistration = stoppingToken.Register(_stopping.Cancel);
        var loop = new EvaluationLoop(pipeline, options.Value.TickInterval, realClock, logger)
            .RunAsync((batches, ct) => EvaluateAsync(batches, null, [], ct), stoppingToken);
        return leadership is ILeadershipElection election ? Task.WhenAll(loop, election.RunAsync(stoppingToken)) : loop;
    }

    /// <summary>
    /// Restores the state from the database and makes this node's run current with the leadership epoch held now,
    /// then evaluates once with the start-up entries. Called with the gate held.
    /// </summary>
    private async Task TakeOverLockedAsync(CancellationToken cancellationToken)
    {
        var epoch = leadership.Epoch;
        if (!leadership.IsLeader || (_evaluator is not null && _runEpoch == epoch))
        {
            return;
        }
        var now = clock.GetUtcNow();
        var restore = await _startup.RestoreAsync(_profile!, now, _switchedFrom, cancellationToken);
        _switchedFrom = null;
        if (restore.Stopped is not null)
        {
            _stopped = restore.Stopped;
            return;
        }
        var hostEntries = restore.HostEntries;
        if (leadership is ILeadershipElection)
        {
            hostEntries = [.. hostEntries, AuditEvents.HostEntry("leadership_taken", now, new { node = leadership.NodeId, epoch })];
        }
        _recorder.Begin(restore.Written, restore.ReadingsCoveredTo, epoch, now);
        _runEpoch = epoch;
        _evaluator = new EngineEvaluator(restore.Run!, restore.State!, _recorder, _publisher, feeds, _feedJournal, clock, realClock,
            logger, loggerFactory.CreateLogger(NightLog.Category), retentionAlarm, inboxAlarms);
        await EvaluateLockedAsync([], null, hostEntries, cancellationToken);
        if (restore.Acknowledged)
        {
            // the anchors before this one described the chain the administrator acknowledged as lost (docs/audit.md "Anchors")
            await tamper.AnchorResetAsync(cancellationToken);
        }
    }

    private void OnLeadershipChanged(bool leader)
    {
        if (!leader)
        {
            // stop evaluating at once; an evaluation in flight is fenced by its epoch (docs/engine.md R71)
            _evaluator = null;
            logger.LogWarning("Node {Node} is a standby now: no evaluation, no ticks", leadership.NodeId);
            return;
        }
        _ = Task.Run(async () =>
        {
            try
            {
                await _gate.WaitAsync(_stopping.Token);
                try
                {
                    await TakeOverLockedAsync(_stopping.Token);
                }
                finally
                {
                    _gate.Release();
                }
            }
            catch (OperationCanceledException) when (_stopping.IsCancellationRequested)
            {
            }
            catch (Exception ex)
            {
                logger.LogError(ex, "Node {Node} took leadership but could not restore the engine: {Error}; giving leadership up", leadership.NodeId, ex.Message);
                _evaluator = null;
                (leadership as ILeadershipElection)?.StepDown($"restore failed: {ex.Message}");
            }
        });
    }

    private async Task<EvaluationOutcome> EvaluateAsync(IReadOnlyList<ReadingBatch> batches, EngineCommand? command, IReadOnlyList<NewAuditEntry> hostEntries, CancellationToken cancellationToken, IReadOnlyList<long>? removeInbox = null)
    {
        if (_evaluator is null && !(leadership.IsLeader && _profile is not null && _stopped is null))
        {
            return NotEvaluated(batches);
        }
        await _gate.WaitAsync(cancellationToken);
        try
        {
            if (_evaluator is null || _runEpoch != leadership.Epoch)
            {
                // leadership was just won and its takeover has not run yet: restore first, so a command or reading that
                // arrives in that moment is evaluated by the new leader instead of being refused
                await TakeOverLockedAsync(cancellationToken);
            }
            return await EvaluateLockedAsync(batches, command, hostEntries, cancellationToken, removeInbox);
        }
        finally
        {
            _gate.Release();
        }
    }

    private async Task<EvaluationOutcome> EvaluateLockedAsync(IReadOnlyList<ReadingBatch> batches, EngineCommand? command, IReadOnlyList<NewAuditEntry> hostEntries, CancellationToken cancellationToken, IReadOnlyList<long>? removeInbox = null)
    {
        var evaluator = _evaluator;
        if (evaluator is null || !leadership.IsLeader || leadership.Epoch != _runEpoch)
        {
            // a standby never evaluates or appends (docs/engine.md R70)
            _evaluator = null;
            return NotEvaluated(batches);
        }
        try
        {
            return await evaluator.EvaluateAsync(batches, command, hostEntries, cancellationToken, removeInbox);
        }
        catch (StaleEpochException ex)
        {
            logger.LogError("Node {Node}: {Error}; stepping down", leadership.NodeId, ex.Message);
            _evaluator = null;
            (leadership as ILeadershipElection)?.StepDown(ex.Message);
            _recorder.Refuse(batches, ex.Message);
            return new EvaluationOutcome(false, [], [], ex.Message);
        }
    }

    private EvaluationOutcome NotEvaluated(IReadOnlyList<ReadingBatch> batches)
    {
        var reason = _stopped is not null || _profile is null || leadership.IsLeader ? "the engine host is not running" : StandbyText;
        foreach (var batch in batches)
        {
            batch.Receipt?.Refuse(reason);
        }
        return new EvaluationOutcome(false, [], [], reason);
    }

    public override void Dispose()
    {
        leadership.LeadershipChanged -= OnLeadershipChanged;
        // a stop after disposal (a test host's second stop) must not reach the disposed source
        _stoppingRegistration.Dispose();
        _stopping.Dispose();
        _gate.Dispose();
        base.Dispose();
    }
}
