using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Optics;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Anchors;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Live;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Engine;

/// <summary>
/// The live heart of the server (DEVELOPERS.md "Data flow"; docs/engine.md R7, R12). At start: migrate and check the database, load the validated
/// profile, restore the persisted engine state (restart recovery: phase, episode, holds, pending, items and running
/// dwells, which are start instants), and evaluate at "now" so dwells that completed while the server was down fire
/// at their exact instants. Then it evaluates on every reading batch and on a tick, one evaluation at a time.
/// <para>Each evaluation stores the batch's readings (with reject reasons), then commits one audit entry per
/// meaningful event together with the new state in ONE <see cref="AuditStore.AppendAsync"/>; only after that
/// commit does the state become current and get published. A failed commit keeps the old state, raises the
/// audit-storage-failing alarm and retries on the next evaluation (readings are carried over).</para>
/// <para>State write rule: the state row is written with every evaluation that has audit entries, whenever any part
/// other than the latest readings and the evaluation instant changed (dwell start instants in HoldingSince, phase,
/// pending, hold, items, alarms, forecast, service marks, escalation measure), and otherwise at most every
/// <see cref="EngineOptions.StateFlushInterval"/>. So a running dwell's start instant is durable before the
/// evaluation that started it returns; after a kill only up to one flush interval of latest readings is lost.</para>
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
    TamperCheck tamper) : BackgroundService
{
    private readonly ILogger _night = loggerFactory.CreateLogger(NightLog.Category);

    private const int MaxBatchesPerEvaluation = 64;

    private static readonly TimeSpan s_heartbeat = TimeSpan.FromSeconds(2);

    private static readonly TimeSpan s_resumeRetry = TimeSpan.FromSeconds(1);

    /// <summary>The engine's time may lead the clock by this much (a commit and a read of the clock race) before it counts as the clock stepping back.</summary>
    private static readonly TimeSpan s_clockTolerance = TimeSpan.FromSeconds(2);

    private static readonly TimeSpan s_clockAlarmShownFor = TimeSpan.FromMinutes(10);

    private readonly SemaphoreSlim _gate = new(1, 1);
    private readonly FeedHealthJournal _feedJournal = new(feedsOptions.Value.HealthAuditInterval);
    private LvpEngine? _engine;
    private RvrDerivation? _derivation;
    private RvrTrends? _trends;
    private EngineState? _state;
    private EngineState? _written;
    private DateTimeOffset _lastWriteReal;
    private DateTimeOffset _lastPublishReal;
    private EngineState? _published;
    private long _version;
    private string? _auditError;
    private DateTimeOffset? _auditFailingSince;
    private DateTimeOffset? _lastEvaluationAt;
    private DateTimeOffset _lastResumeAttemptReal;
    private int _refusedBatches;
    private Alarm? _clockAlarm;
    private string? _stopped;
    private long _refusedReadings;
    private long _readingsCoveredTo;

    /// <summary>The profile in use; null before start or when the host is disabled.</summary>
    public AerodromeProfile? Profile => _engine?.Profile;

    /// <summary>The current (committed) state; null before start.</summary>
    public EngineState? State => _state;

    public EngineHealth Health => new(
        _engine is not null,
        _lastEvaluationAt,
        _auditError is null ? "ok" : "failing",
        _auditError,
        _engine?.Profile.Version,
        _auditFailingSince,
        _stopped);

    /// <summary>Recording or not, and since when (docs/reliability.md "Storage faults").</summary>
    public RecordingView Recording => _auditError is null ? RecordingView.Ok : new RecordingView(false, _auditFailingSince, _auditError);

    public override async Task StartAsync(CancellationToken cancellationToken)
    {
        var o = options.Value;
        if (!o.Enabled)
        {
            logger.LogWarning("Engine host disabled (Engine:Enabled=false): no evaluation, no live state");
            return;
        }
        string? switchedFrom;
        try
        {
            switchedFrom = await DatabaseStartup.MigrateAndCheckAsync(dbFactory, cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            logger.LogCritical(ex, "OpsLvp cannot start: the database could not be migrated or is not durable: {Error}", ex.Message);
            throw new InvalidOperationException($"OpsLvp cannot start: the database could not be migrated or is not durable (WAL + synchronous=FULL): {ex.Message}", ex);
        }
        var path = paths.Resolve(o.ProfilePath);
        AerodromeProfile profile;
        try
        {
            profile = ProfileValidator.LoadValidated(path);
        }
        catch (Exception ex) when (ex is ProfileException or IOException or UnauthorizedAccessException)
        {
            logger.LogCritical("OpsLvp cannot start: Engine:ProfilePath '{Path}': {Error}", path, ex.Message);
            throw new InvalidOperationException($"OpsLvp cannot start: Engine:ProfilePath '{path}': {ex.Message}", ex);
        }
        _engine = new LvpEngine(profile);
        _derivation = new RvrDerivation(profile);
        _trends = new RvrTrends(profile);
        var now = clock.GetUtcNow();
        var persisted = await audit.GetLatestStateAsync(cancellationToken);
        var restored = false;
        NewAuditEntry? acknowledged = null;
        if ((await StateMismatchAsync(persisted, cancellationToken) ?? await tamper.CheckAsync(persisted, cancellationToken)) is { } mismatch)
        {
            if (o.AcknowledgeStateMismatch != mismatch.Head)
            {
                _stopped = $"{mismatch.Text}; the engine stays stopped until an administrator acknowledges it (restart with Engine:AcknowledgeStateMismatch={mismatch.Head})";
                logger.LogCritical("OpsLvp engine stopped: {Reason}", _stopped);
                _engine = null;
                return;
            }
            logger.LogWarning("State mismatch acknowledged by Engine:AcknowledgeStateMismatch={Head}: {Mismatch}; starting from the initial state", mismatch.Head, mismatch.Text);
            acknowledged = AuditEvents.HostEntry("state_mismatch_acknowledged", now, new { mismatch = mismatch.Text, head = mismatch.Head });
            persisted = null;
        }
        if (persisted is not null)
        {
            try
            {
                _state = EngineStateJson.Deserialize(persisted.StateJson);
                restored = true;
                if (persisted.ProfileVersion != profile.Version)
                {
                    logger.LogWarning("Restored state was saved with profile {Old}; now running {New}", persisted.ProfileVersion, profile.Version);
                }
            }
            catch (System.Text.Json.JsonException ex)
            {
                logger.LogError(ex, "The stored engine state could not be read; starting from the initial state");
            }
        }
        _state ??= _engine.Initial(now);
        // the restored setting applies to raw readings from its instant on, as it did live (docs/engine.md R20)
        _derivation.ManualStep = _state.ManualLightStep;
        await RebuildAveragingAsync(now, cancellationToken);
        _written = restored ? _state : null;
        var started = AuditEvents.HostEntry("engine_started", now, new
        {
            profile = profile.Version,
            restored,
            restoredPhase = restored ? _state.Phase.ToString() : null,
            stateEvaluatedAt = restored ? _state.EvaluatedAt : (DateTimeOffset?)null,
        });
        logger.LogInformation("Engine host started with profile {Profile}; state {How} (phase {Phase})", profile.Version, restored ? "restored" : "initial", _state.Phase);
        var hostEntries = new List<NewAuditEntry> { started };
        if (acknowledged is not null)
        {
            hostEntries.Add(acknowledged);
        }
        if (switchedFrom is not null)
        {
            logger.LogWarning("The database was in journal mode '{Mode}'; switched to WAL at start", switchedFrom);
            hostEntries.Add(AuditEvents.HostEntry("journal_mode_switched", now, new { from = switchedFrom, to = "wal" }));
        }
        var lastRecorded = await audit.GetLastOfKindAsync(ProfileRecord.Kind, cancellationToken);
        if (lastRecorded is null || ProfileRecord.ShaOf(lastRecorded) != ProfileRecord.Sha256(profile))
        {
            // The whole profile goes on record whenever it is not the one last recorded, so the review can judge
            // each episode by the thresholds then in force.
            hostEntries.Add(ProfileRecord.Entry(profile, now));
        }
        _readingsCoveredTo = await tamper.ReadingsCoveredToAsync(cancellationToken);
        await EvaluateAsync([], null, hostEntries, cancellationToken);
        if (acknowledged is not null)
        {
            // the anchors before this one described the chain the administrator acknowledged as lost (docs/audit.md "Anchors")
            await tamper.AnchorResetAsync(cancellationToken);
        }
        await base.StartAsync(cancellationToken);
    }

    /// <summary>
    /// The stored state names the audit entry it reflects (sequence and hash, written in the same transaction). A
    /// chain that ends before that entry was cut short; an entry there with another hash was rewritten. Entries after
    /// it are normal (account and key changes append without a state). Null when they agree or nothing is stored.
    /// </summary>
    private async Task<(string Text, long Head)?> StateMismatchAsync(PersistedEngineState? persisted, CancellationToken cancellationToken)
    {
        if (persisted is null)
        {
            return null;
        }
        var head = await audit.GetHeadAsync(cancellationToken);
        var headSequence = head?.Sequence ?? 0;
        if (persisted.AuditSequence > headSequence)
        {
            return ($"the stored engine state reflects audit entry {persisted.AuditSequence} but the audit chain ends at {headSequence}: entries were removed", headSequence);
        }
        if (persisted.AuditHash is { } hash && persisted.AuditSequence > 0)
        {
            var entry = (await audit.GetRangeAsync(persisted.AuditSequence, persisted.AuditSequence, cancellationToken)).SingleOrDefault();
            if (entry is null || !string.Equals(entry.Hash, hash, StringComparison.Ordinal))
            {
                return ($"audit entry {persisted.AuditSequence} does not have the hash the stored engine state recorded for it: the chain was rewritten", headSequence);
            }
        }
        return null;
    }

    /// <summary>
    /// After a restart the 1-minute RVR means of raw sensors and the 10-minute tendencies would start from nothing,
    /// and the first derived RVR values would rest on fewer samples than before the restart. The readings received in
    /// the last 10 minutes are in the readings table, so both are rebuilt from them in receipt order, as live fed
    /// them: every raw reading to the derivation, every accepted RVR (raw or derived) to the tendencies.
    /// </summary>
    private async Task RebuildAveragingAsync(DateTimeOffset now, CancellationToken cancellationToken)
    {
        IReadOnlyList<ReceivedReading> recent;
        try
        {
            recent = await readingStore.GetReceivedAsync(now - RvrAveraging.TenMinutes, now, cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            logger.LogWarning(ex, "Recent readings could not be read; RVR means and tendencies start empty");
            return;
        }
        foreach (var row in recent)
        {
            if (row.AsReading() is not { } reading)
            {
                continue;
            }
            if (!row.IsDerived)
            {
                _ = _derivation!.Observe(reading);
            }
            if (row.Accepted)
            {
                _trends!.Add(reading);
            }
        }
    }

    /// <summary>Evaluates one command through the single evaluation path (used by the command service).</summary>
    public Task<EvaluationOutcome> ExecuteAsync(EngineCommand command, CancellationToken cancellationToken = default) =>
        EvaluateAsync([], command, [], cancellationToken);

    protected override Task ExecuteAsync(CancellationToken stoppingToken) =>
        Task.WhenAll(ConsumeReadingsAsync(stoppingToken), TickAsync(stoppingToken));

    private async Task ConsumeReadingsAsync(CancellationToken stoppingToken)
    {
        await Task.Yield();
        try
        {
            await foreach (var batch in pipeline.ReadAllAsync(stoppingToken))
            {
                // batches queued meanwhile are taken in the same evaluation (same order, one commit)
                var batches = new List<ReadingBatch> { batch };
                while (batches.Count < MaxBatchesPerEvaluation && pipeline.TryRead(out var more) && more is not null)
                {
                    batches.Add(more);
                }
                await EvaluateGuardedAsync(batches, stoppingToken);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private async Task TickAsync(CancellationToken stoppingToken)
    {
        var interval = options.Value.TickInterval;
        if (interval <= TimeSpan.Zero || interval > TimeSpan.FromSeconds(1))
        {
            interval = TimeSpan.FromSeconds(1);
        }
        using var timer = new PeriodicTimer(interval, realClock);
        try
        {
            while (await timer.WaitForNextTickAsync(stoppingToken))
            {
                await EvaluateGuardedAsync([], stoppingToken);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private async Task EvaluateGuardedAsync(IReadOnlyList<ReadingBatch> batches, CancellationToken stoppingToken)
    {
        try
        {
            await EvaluateAsync(batches, null, [], stoppingToken);
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
            throw;
        }
        catch (Exception ex)
        {
            // Nothing a feed sends may stop the engine loop.
            logger.LogError(ex, "Evaluation failed");
        }
    }

    private async Task<EvaluationOutcome> EvaluateAsync(IReadOnlyList<ReadingBatch> batches, EngineCommand? command, IReadOnlyList<NewAuditEntry> hostEntries, CancellationToken cancellationToken)
    {
        if (_engine is null || _state is null)
        {
            return new EvaluationOutcome(false, [], [], "the engine host is not running");
        }
        await _gate.WaitAsync(cancellationToken);
        try
        {
            return await EvaluateLockedAsync(batches, command, hostEntries, cancellationToken);
        }
        finally
        {
            _gate.Release();
        }
    }

    private async Task<EvaluationOutcome> EvaluateLockedAsync(IReadOnlyList<ReadingBatch> batches, EngineCommand? command, IReadOnlyList<NewAuditEntry> hostEntries, CancellationToken cancellationToken)
    {
        var engine = _engine!;
        var now = clock.GetUtcNow();
        var realNow = realClock.GetUtcNow();
        if (_auditError is not null && !await TryResumeRecordingAsync(now, realNow, force: command is not null, cancellationToken))
        {
            // Not recording (docs/reliability.md "Storage faults"): nothing is evaluated, so nothing the history cannot show is applied,
            // published as current or acknowledged to a feed.
            Refuse(batches, _auditError!);
            Publish(_state!, now, realNow, force: true);
            return new EvaluationOutcome(false, [], [], NotRecordingText());
        }
        var old = _state!;
        if (old.EvaluatedAt > now + s_clockTolerance)
        {
            // The clock stepped back (or a demo restarted on a folder whose demo clock ran ahead): the engine would
            // treat every reading as older than the latest and refuse it. Record it, alarm, and start monitoring
            // afresh from the clock's now, as after a recording gap (docs/reliability.md "Clock regression").
            var ahead = old.EvaluatedAt - now;
            logger.LogError("Clock regression: engine time {EngineTime} is {Ahead} ahead of the clock {Now}; monitoring restarts from the clock", old.EvaluatedAt, ahead, now);
            _clockAlarm = new Alarm(SnapshotBuilder.ClockRegressionKey, AlarmKind.ClockRegression,
                $"clock stepped back: engine time was {OpsLvp.Core.Audit.AuditCanonical.FormatTime(old.EvaluatedAt)}, {ahead.TotalSeconds:0} s ahead; readings before that were set aside and monitoring restarted", now);
            hostEntries = [AuditEvents.HostEntry("clock_regression", now, new { engineTime = old.EvaluatedAt, clock = now, aheadSeconds = ahead.TotalSeconds }), .. hostEntries];
            old = Rebase(old, now);
        }

        // the duty manager's light-step setting as of this evaluation, as the replay runner does (docs/engine.md R20)
        _derivation!.ManualStep = old.ManualLightStep;
        var inputs = new List<EngineInput>();
        var fresh = new List<(Reading Reading, string Source)>();
        var perBatch = new List<(ReadingBatch Batch, int From, int To)>();
        foreach (var batch in batches)
        {
            var from = fresh.Count;
            foreach (var r in batch.Readings)
            {
                if (r is null)
                {
                    continue;
                }
                inputs.Add(new ReadingInput(r));
                fresh.Add((r, batch.Source));
                foreach (var d in _derivation!.Observe(r))
                {
                    inputs.Add(new ReadingInput(d));
                    fresh.Add((d, batch.Source + ":derived"));
                }
            }
            perBatch.Add((batch, from, fresh.Count));
            foreach (var f in batch.Forecasts)
            {
                // received now, as a replay of the recorded forecast_received sees it (docs/engine.md R25)
                inputs.Add(f with { ReceivedAt = now });
            }
        }
        if (command is not null)
        {
            inputs.Add(command);
        }

        var result = engine.Evaluate(old, inputs, now);
        var rejected = new Dictionary<Reading, ReadingRejected>(ReferenceEqualityComparer.Instance);
        foreach (var e in result.Events)
        {
            if (e is ReadingRejected rr)
            {
                rejected.TryAdd(rr.Reading, rr);
            }
            else if (e is ForecastRejected fr)
            {
                logger.LogWarning("Forecast rejected ({Origin}): {Reason}: {Text}", fr.Origin, fr.Reason, fr.Text);
            }
        }

        if (perBatch.Count > 0)
        {
            try
            {
                await StoreReadingsAsync(perBatch, fresh, rejected, cancellationToken);
            }
            catch (Exception ex) when (ex is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
            {
                StopRecording(now, $"readings not stored: {Describe(ex)}", ex);
                Refuse(batches, _auditError!);
                Publish(old, now, realNow, force: true);
                return new EvaluationOutcome(false, result.Events, [], NotRecordingText());
            }
        }

        // Engine events first: at a start they include what fell due while the server was stopped, stamped at those
        // instants, and the host's entries (engine_started, ...) are stamped now, so the chain's times never go back.
        var entries = new List<NewAuditEntry>();
        entries.AddRange(result.Events.Where(AuditEvents.IsAudited).Select(AuditEvents.ToEntry));
        entries.AddRange(hostEntries);
        var feedSnapshot = feeds.Snapshot();
        var feedChanges = _feedJournal.Observe(feedSnapshot, now, realNow);
        entries.AddRange(feedChanges.Select(c => c.Entry));

        var state = result.State;
        var mustWrite = entries.Count > 0
            || _written is null
            || !Structural(state).Equals(Structural(_written))
            || realNow - _lastWriteReal >= options.Value.StateFlushInterval;
        IReadOnlyList<OpsLvp.Core.Audit.AuditEntry> committed = [];
        if (mustWrite)
        {
            var coveredTo = _readingsCoveredTo;
            try
            {
                if (TamperCheck.CoveringIndex(entries) is { } covering)
                {
                    // the readings received since the last covering entry, so an edited readings table shows (docs/audit.md "Readings covered")
                    var coverage = await readingStore.CoverAsync(_readingsCoveredTo, null, cancellationToken);
                    entries[covering] = entries[covering] with { PayloadJson = coverage.AddTo(entries[covering].PayloadJson) };
                    coveredTo = coverage.To;
                }
                committed = await audit.AppendAsync(
                    entries,
                    new EngineStateWrite(EngineStateJson.Serialize(state), engine.Profile.Version, now),
                    cancellationToken);
            }
            catch (Exception ex) when (ex is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
            {
                StopRecording(now, ex is AuditCommitException ? ex.Message : Describe(ex), ex);
                Refuse(batches, _auditError!);
                Publish(old, now, realNow, force: true);
                return new EvaluationOutcome(false, result.Events, [], NotRecordingText());
            }
            _written = state;
            _lastWriteReal = realNow;
            _readingsCoveredTo = coveredTo;
        }
        foreach (var batch in batches)
        {
            batch.Receipt?.Confirm();
        }
        _feedJournal.Recorded(feedChanges, realNow);
        // the night's account, only of what the commit above put on record (docs/deployment.md "The server log")
        NightLog.Write(_night, result.Events, feedChanges, now);
        foreach (var (reading, _) in fresh)
        {
            if (!rejected.ContainsKey(reading))
            {
                _trends!.Add(reading);
            }
        }
        _state = state;
        _lastEvaluationAt = now;
        Publish(state, now, realNow, force: result.Events.Count > 0 || entries.Count > 0);
        return new EvaluationOutcome(true, result.Events, committed, null);
    }

    private static string Describe(Exception ex) => $"{ex.GetType().Name}: {(ex.InnerException ?? ex).Message.ReplaceLineEndings(" ")}";

    private string NotRecordingText() =>
        $"not recording since {OpsLvp.Core.Audit.AuditCanonical.FormatTime(_auditFailingSince ?? default)}: {_auditError}";

    /// <summary>Storage failed: from now on nothing is evaluated or acknowledged until a write succeeds again.</summary>
    private void StopRecording(DateTimeOffset now, string error, Exception ex)
    {
        if (_auditError is null)
        {
            _auditFailingSince = now;
            _refusedBatches = 0;
            _refusedReadings = 0;
            logger.LogError(ex, "NOT RECORDING since {Since}: {Error}; readings are refused and actions not applied until storage works again", now, error);
        }
        _auditError = error;
    }

    private void Refuse(IReadOnlyList<ReadingBatch> batches, string reason)
    {
        foreach (var batch in batches)
        {
            _refusedBatches++;
            _refusedReadings += batch.Readings.Count;
            batch.Receipt?.Refuse(reason);
        }
    }

    /// <summary>
    /// While not recording, each evaluation (at most one a second, but every command) first tries to write the gap's one audit entry
    /// (start, end, reason, what was refused) together with the state rebased at <paramref name="now"/>. What the
    /// engine knew from readings before the gap is dropped (latest readings, running dwells, monitoring start), so
    /// the first evaluation after the gap neither stamps events inside it nor counts a dwell across it (docs/reliability.md).
    /// </summary>
    private async Task<bool> TryResumeRecordingAsync(DateTimeOffset now, DateTimeOffset realNow, bool force, CancellationToken cancellationToken)
    {
        if (!force && realNow - _lastResumeAttemptReal < s_resumeRetry)
        {
            return false;
        }
        _lastResumeAttemptReal = realNow;
        var rebased = Rebase(_state!, now);
        var gap = AuditEvents.HostEntry(AuditEvents.RecordingGap, now, new
        {
            from = _auditFailingSince,
            to = now,
            reason = _auditError,
            refusedBatches = _refusedBatches,
            refusedReadings = _refusedReadings,
        });
        try
        {
            await audit.AppendAsync([gap], new EngineStateWrite(EngineStateJson.Serialize(rebased), _engine!.Profile.Version, now), cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
        {
            _auditError = ex is AuditCommitException ? ex.Message : Describe(ex);
            logger.LogDebug(ex, "Still not recording: {Error}", _auditError);
            return false;
        }
        logger.LogWarning("Recording resumed: gap from {From} to {To} ({Batches} batch(es), {Readings} reading(s) refused)", _auditFailingSince, now, _refusedBatches, _refusedReadings);
        _state = rebased;
        _written = rebased;
        _lastWriteReal = realNow;
        _auditError = null;
        _auditFailingSince = null;
        try
        {
            // the WAL grew (or failed to) during the outage; fold it back into the database now there is room
            await audit.CheckpointAsync(cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            logger.LogWarning(ex, "WAL checkpoint after the recording gap failed");
        }
        return true;
    }

    /// <summary>The state as known right after a recording gap: no readings and no running dwell from before it.</summary>
    internal static EngineState Rebase(EngineState state, DateTimeOffset now) => state with
    {
        EvaluatedAt = now,
        MonitoringSince = now,
        Latest = System.Collections.Immutable.ImmutableDictionary<string, Reading>.Empty,
        HoldingSince = System.Collections.Immutable.ImmutableDictionary<ConditionKind, DateTimeOffset>.Empty,
    };

    /// <summary>The state without the parts that change with every reading (they are flushed on the interval).</summary>
    private static EngineState Structural(EngineState s) => s with
    {
        EvaluatedAt = default,
        Latest = System.Collections.Immutable.ImmutableDictionary<string, Reading>.Empty,
    };

    private async Task StoreReadingsAsync(List<(ReadingBatch Batch, int From, int To)> batches, List<(Reading Reading, string Source)> fresh, Dictionary<Reading, ReadingRejected> rejected, CancellationToken cancellationToken)
    {
        var rows = new List<ReceivedReading>(fresh.Count);
        foreach (var (batch, from, to) in batches)
        {
            foreach (var j in batch.Rejections)
            {
                rows.Add(new ReceivedReading(batch.ReceivedAt, batch.Source, j.SensorId ?? "", "unparsed", null, null, null, false, j.Reason, $"item {j.Index}: {j.Detail}"));
            }
            for (var i = from; i < to; i++)
            {
                var (reading, source) = fresh[i];
                rows.Add(rejected.TryGetValue(reading, out var why)
                    ? ReceivedReading.Reject(reading, batch.ReceivedAt, source, why.Reason, why.Detail)
                    : ReceivedReading.Accept(reading, batch.ReceivedAt, source));
            }
        }
        await readingStore.InsertAsync(rows, cancellationToken);
    }

    private void Publish(EngineState state, DateTimeOffset now, DateTimeOffset realNow, bool force)
    {
        var changed = _published is null || !(state with { EvaluatedAt = default }).Equals(_published with { EvaluatedAt = default });
        if (!force && !changed && realNow - _lastPublishReal < s_heartbeat)
        {
            return;
        }
        _version = Math.Max(_version + 1, realNow.ToUnixTimeMilliseconds());
        var hostAlarms = new List<Alarm>(2);
        if (_auditError is not null)
        {
            hostAlarms.Add(new Alarm(SnapshotBuilder.AuditFailingKey, AlarmKind.AuditStorageFailing, $"not recording: {_auditError}; readings are refused and actions are not applied", _auditFailingSince ?? now));
        }
        if (_clockAlarm is { } clockAlarm && now - clockAlarm.RaisedAt < s_clockAlarmShownFor)
        {
            hostAlarms.Add(clockAlarm);
        }
        var snapshot = SnapshotBuilder.Build(
            _version, _engine!, state, now, feeds.Snapshot(), _trends!.At(now),
            demo.Enabled ? new DemoView(demo.Speed) : null, hostAlarms, Recording, StepInUse(state, now));
        _published = state;
        _lastPublishReal = realNow;
        live.Publish(snapshot);
    }

    /// <summary>The light step in use at <paramref name="now"/> with <paramref name="state"/>'s manual setting (docs/engine.md R20).</summary>
    private LightStepInUse StepInUse(EngineState state, DateTimeOffset now)
    {
        _derivation!.ManualStep = state.ManualLightStep;
        return _derivation.StepInUse(now);
    }

    public override void Dispose()
    {
        _gate.Dispose();
        base.Dispose();
    }
}
