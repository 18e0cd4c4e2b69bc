using OpsLvp.Core.Engine;
using OpsLvp.Core.Readings;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Engine;

/// <summary>
/// One evaluation of the engine host (docs/engine.md R7, R12): the batch's readings (and RVR derived from raw
/// sensors) and the command go to the pure <see cref="LvpEngine.Evaluate"/>; the readings are stored, the audit
/// entries committed with the new state by the <see cref="EngineRecorder"/>, and only after that commit the state
/// becomes current and the <see cref="EnginePublisher"/> publishes it. A failed commit keeps the old state. Callers
/// run one evaluation at a time.
/// </summary>
internal sealed class EngineEvaluator(
    EngineRun run,
    EngineState state,
    EngineRecorder recorder,
    EnginePublisher publisher,
    FeedHealthRegistry feeds,
    FeedHealthJournal feedJournal,
    TimeProvider clock,
    TimeProvider realClock,
    ILogger logger,
    ILogger night,
    OpsLvp.Web.Retention.RetentionAlarm? retentionAlarm = null,
    OpsLvp.Web.Cluster.InboxAlarms? inboxAlarms = null)
{
    /// <summary>The engine's time may lead the clock by this much (a commit and a read of the clock race) before it counts as the clock stepping back.</summary>
    private static readonly TimeSpan s_clockTolerance = TimeSpan.FromSeconds(2);

    private static readonly TimeSpan s_clockAlarmShownFor = TimeSpan.FromMinutes(10);

    private Alarm? _clockAlarm;

    public EngineRun Run => run;

    /// <summary>The current (committed) state.</summary>
    public EngineState State { get; private set; } = state;

    /// <summary>App-clock instant of the last committed evaluation.</summary>
    public DateTimeOffset? LastEvaluationAt { get; private set; }

    /// <summary>
    /// One evaluation. <paramref name="removeInbox"/>: reading inbox rows the commit deletes with its audit entries (a
    /// batch set aside, docs/engine.md R82).
    /// </summary>
    /// <exception cref="InboxBatchFaultException">Inbox batches the database refused for their content; nothing was written and recording goes on.</exception>
    public async Task<EvaluationOutcome> EvaluateAsync(IReadOnlyList<ReadingBatch> batches, EngineCommand? command, IReadOnlyList<NewAuditEntry> hostEntries, CancellationToken cancellationToken, IReadOnlyList<long>? removeInbox = null)
    {
        var engine = run.Engine;
        var now = clock.GetUtcNow();
        var realNow = realClock.GetUtcNow();
        if (recorder.Error is not null)
        {
            if (await recorder.TryResumeAsync(State, engine.Profile.Version, now, realNow, force: command is not null, cancellationToken) is { } rebased)
            {
                State = rebased;
            }
            else
            {
                // Not recording (docs/reliability.md "Storage faults"): nothing is evaluated, so nothing the history cannot show is applied,
                // published as current or acknowledged to a feed.
                recorder.Refuse(batches, recorder.Error!);
                Publish(State, now, realNow, force: true);
                return new EvaluationOutcome(false, [], [], recorder.NotRecordingText());
            }
        }
        Action? afterCommit = null;
        if (command is AcknowledgeAlarm { AlarmKey: OpsLvp.Web.Retention.RetentionAlarm.Key } ack && retentionAlarm is not null)
        {
            // a host alarm (docs/engine.md R78): acknowledged here, on record as a host entry in the person's name
            if (retentionAlarm.CannotAcknowledge() is { } why)
            {
                return new EvaluationOutcome(true, [new CommandRefused(now, ack, why)], [], null);
            }
            var raised = retentionAlarm.Current!;
            hostEntries = [.. hostEntries, new NewAuditEntry(ack.Actor, AuditEvents.RetentionAlarmAcknowledged, System.Text.Json.JsonSerializer.Serialize(new { key = raised.Key, message = raised.Message, raisedAt = raised.RaisedAt }, System.Text.Json.JsonSerializerOptions.Web), now)];
            command = null;
            afterCommit = () => retentionAlarm.Acknowledge(ack.Actor, now);
        }
        var old = State;
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
            old = EngineRecorder.Rebase(old, now);
        }

        // the duty manager's light-step setting as of this evaluation, as the replay runner does (docs/engine.md R20)
        run.Derivation.ManualStep = old.ManualLightStep;
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
                foreach (var d in run.Derivation.Observe(r))
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
                await recorder.StoreReadingsAsync(perBatch, fresh, rejected, cancellationToken);
            }
            catch (StaleEpochException)
            {
                // not a storage fault: another node leads (docs/engine.md R71); the host steps down
                throw;
            }
            catch (InboxClaimLostException ex)
            {
                // another node stored these inbox batches first: not a storage fault, nothing written (docs/engine.md R74)
                logger.LogWarning("Inbox batches not stored here: {Reason}", ex.Message);
                recorder.Refuse(batches, ex.Message);
                return new EvaluationOutcome(false, result.Events, [], ex.Message);
            }
            catch (Exception ex) when (batches.All(b => b.InboxId is not null) && InboxBatchFaultException.IsBatchFault(ex))
            {
                // the database refuses these inbox batches for their content (a data or constraint error), not for
                // its own state: recording goes on, and the drain tries the head batch alone and then sets it aside
                // (docs/engine.md R82) instead of stopping the recording of everything else
                throw new InboxBatchFaultException(EngineRecorder.Describe(ex), ex);
            }
            catch (Exception ex) when (ex is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
            {
                recorder.StopRecording(now, $"readings not stored: {EngineRecorder.Describe(ex)}", ex);
                recorder.Refuse(batches, recorder.Error!);
                Publish(old, now, realNow, force: true);
                return new EvaluationOutcome(false, result.Events, [], recorder.NotRecordingText());
            }
        }

        // Engine events first: at a start they include what fell due while the server was stopped, stamped at those
        // instants, and the host's entries (engine_started, ...) are stamped now, so the chain's times never go back.
        var entries = new List<NewAuditEntry>();
        entries.AddRange(result.Events.Where(AuditEvents.IsAudited).Select(AuditEvents.ToEntry));
        entries.AddRange(hostEntries);
        var feedSnapshot = feeds.Snapshot();
        var feedChanges = feedJournal.Observe(feedSnapshot, now, realNow);
        entries.AddRange(feedChanges.Select(c => c.Entry));

        var next = result.State;
        if (await recorder.CommitAsync(entries, next, engine.Profile.Version, now, realNow, cancellationToken, removeInbox) is not { } committed)
        {
            recorder.Refuse(batches, recorder.Error!);
            Publish(old, now, realNow, force: true);
            return new EvaluationOutcome(false, result.Events, [], recorder.NotRecordingText());
        }
        foreach (var batch in batches)
        {
            batch.Receipt?.Confirm();
        }
        feedJournal.Recorded(feedChanges, realNow);
        // the night's account, only of what the commit above put on record (docs/deployment.md "The server log")
        NightLog.Write(night, result.Events, feedChanges, now);
        foreach (var (reading, _) in fresh)
        {
            if (!rejected.ContainsKey(reading))
            {
                run.Trends.Add(reading);
            }
        }
        State = next;
        LastEvaluationAt = now;
        afterCommit?.Invoke();
        Publish(next, now, realNow, force: result.Events.Count > 0 || entries.Count > 0);
        return new EvaluationOutcome(true, result.Events, committed, null);
    }

    private void Publish(EngineState state, DateTimeOffset now, DateTimeOffset realNow, bool force)
    {
        var hostAlarms = new List<Alarm>(2);
        if (recorder.Error is not null)
        {
            hostAlarms.Add(new Alarm(SnapshotBuilder.AuditFailingKey, AlarmKind.AuditStorageFailing, $"not recording: {recorder.Error?.TrimEnd('.', ' ')}; readings are refused and actions are not applied", recorder.FailingSince ?? now));
        }
        if (_clockAlarm is { } clockAlarm && now - clockAlarm.RaisedAt < s_clockAlarmShownFor)
        {
            hostAlarms.Add(clockAlarm);
        }
        if (retentionAlarm?.Current is { } retention)
        {
            hostAlarms.Add(retention);
        }
        if (inboxAlarms is not null)
        {
            hostAlarms.AddRange(inboxAlarms.Current(now));
        }
        publisher.Publish(run, state, now, realNow, force, hostAlarms, recorder.Recording);
    }
}
