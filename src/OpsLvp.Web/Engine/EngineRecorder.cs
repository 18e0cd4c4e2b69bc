using OpsLvp.Core.Audit;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Readings;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Anchors;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Engine;

/// <summary>
/// The commit step of the engine host (docs/engine.md R12; docs/reliability.md "Storage faults"): stores a batch's
/// readings (with reject reasons), and commits the audit entries together with the new state in ONE
/// <see cref="AuditStore.AppendFencedAsync"/>. A failed write stops recording: from then on batches are refused and nothing
/// is evaluated until <see cref="TryResumeAsync"/> writes the gap's one entry.
/// <para>State write rule: the state row is written with every evaluation that has audit entries, whenever any part
/// other than the latest readings and the evaluation instant changed (dwell start instants in HoldingSince, phase,
/// pending, hold, items, alarms, forecast, service marks, escalation measure), and otherwise at most every
/// <see cref="EngineOptions.StateFlushInterval"/>. So a running dwell's start instant is durable before the
/// evaluation that started it returns; after a kill only up to one flush interval of latest readings is lost.</para>
/// </summary>
/// <para>Readings cover rule (docs/engine.md R79): when readings were stored since the last covering entry and none
/// covered them for <c>readingsCoverInterval</c> of engine time, the commit adds a <see cref="AuditEvents.ReadingsCovered"/>
/// entry, so a restart digests at most about one interval of readings and an edited readings table shows within one.</para>
internal sealed class EngineRecorder(AuditStore audit, ReadingStore readingStore, TimeSpan stateFlushInterval, TimeSpan readingsCoverInterval, ILogger logger)
{
    private static readonly TimeSpan s_resumeRetry = TimeSpan.FromSeconds(1);

    private EngineState? _written;
    private DateTimeOffset _lastWriteReal;
    private DateTimeOffset _lastResumeAttemptReal;
    private int _refusedBatches;
    private long _refusedReadings;
    private long _readingsCoveredTo;
    private DateTimeOffset _lastCoveredAt;
    private bool _uncoveredStored;

    /// <summary>Why storage is failing; null while recording.</summary>
    public string? Error { get; private set; }

    /// <summary>App-clock instant recording stopped; null while recording.</summary>
    public DateTimeOffset? FailingSince { get; private set; }

    /// <summary>Recording or not, and since when (docs/reliability.md "Storage faults").</summary>
    public RecordingView Recording => Error is null ? RecordingView.Ok : new RecordingView(false, FailingSince, Error);

    public string NotRecordingText() =>
        $"not recording since {AuditCanonical.FormatTime(FailingSince ?? default)}: {Error}";

    private long? _epoch;

    /// <summary>
    /// Starts a run: <paramref name="written"/> is the state already in the database (null: write the first one);
    /// <paramref name="epoch"/> is the leadership epoch every append of the run carries (0: one node, unfenced; docs/engine.md R71).
    /// </summary>
    /// <paramref name="now"/> (engine clock) starts the first readings cover interval.
    public void Begin(EngineState? written, long readingsCoveredTo, long epoch, DateTimeOffset now)
    {
        _written = written;
        _readingsCoveredTo = readingsCoveredTo;
        _lastCoveredAt = now;
        _uncoveredStored = false;
        _epoch = epoch > 0 ? epoch : null;
        Error = null;
        FailingSince = null;
    }

    /// <summary>Stores the batches' readings, accepted and rejected (with the reason); throws when they are not stored.</summary>
    /// <exception cref="StaleEpochException">Inbox batches, and another node has taken leadership: nothing was written.</exception>
    /// <exception cref="InboxClaimLostException">Inbox batches another node has already stored: nothing was written.</exception>
    public async Task StoreReadingsAsync(List<(ReadingBatch Batch, int From, int To)> batches, List<(Reading Reading, string Source)> fresh, Dictionary<Reading, ReadingRejected> rejected, CancellationToken cancellationToken)
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
        // batches from the reading inbox leave it in the transaction that stores their readings (docs/engine.md R74)
        var inbox = batches.Where(b => b.Batch.InboxId is not null).Select(b => b.Batch.InboxId!.Value).ToList();
        await readingStore.InsertAsync(rows, inbox.Count > 0 ? new InboxClaim(inbox, _epoch) : null, cancellationToken);
        _uncoveredStored |= rows.Count > 0;
    }

    /// <summary>
    /// Commits <paramref name="entries"/> and, by the state write rule, <paramref name="state"/>. Returns the entries as
    /// committed (empty when nothing had to be written), or null when the commit failed: recording has stopped then.
    /// </summary>
    /// <exception cref="StaleEpochException">Another node has taken leadership; nothing was written.</exception>
    /// <exception cref="InboxClaimLostException"><paramref name="removeInbox"/> names a row already gone; nothing was written.</exception>
    public async Task<IReadOnlyList<AuditEntry>?> CommitAsync(List<NewAuditEntry> entries, EngineState state, string profileVersion, DateTimeOffset now, DateTimeOffset realNow, CancellationToken cancellationToken, IReadOnlyList<long>? removeInbox = null)
    {
        var covering = TamperCheck.CoveringIndex(entries);
        if (covering is null && _uncoveredStored && now - _lastCoveredAt >= readingsCoverInterval)
        {
            // nothing else covered the stored readings for a whole interval (docs/engine.md R79)
            entries.Add(AuditEvents.HostEntry(AuditEvents.ReadingsCovered, now, new { }));
            covering = entries.Count - 1;
        }
        var mustWrite = entries.Count > 0
            || _written is null
            || !Structural(state).Equals(Structural(_written))
            || realNow - _lastWriteReal >= stateFlushInterval;
        if (!mustWrite)
        {
            return [];
        }
        var coveredTo = _readingsCoveredTo;
        IReadOnlyList<AuditEntry> committed;
        try
        {
            if (covering is { } at)
            {
                // the readings received since the last covering entry, so an edited readings table shows (docs/audit.md "Readings covered")
                var coverage = await readingStore.CoverAsync(_readingsCoveredTo, null, cancellationToken);
                entries[at] = entries[at] with { PayloadJson = coverage.AddTo(entries[at].PayloadJson) };
                coveredTo = coverage.To;
            }
            committed = await audit.AppendFencedAsync(
                entries,
                new EngineStateWrite(EngineStateJson.Serialize(state), profileVersion, now),
                _epoch,
                cancellationToken,
                removeInbox);
        }
        catch (StaleEpochException)
        {
            // not a storage fault: another node leads (docs/engine.md R71); the host steps down
            throw;
        }
        catch (InboxClaimLostException)
        {
            // not a storage fault: another node took the inbox row first (docs/engine.md R82)
            throw;
        }
        catch (Exception ex) when (ex is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
        {
            StopRecording(now, ex is AuditCommitException ? ex.Message : Describe(ex), ex);
            return null;
        }
        _written = state;
        _lastWriteReal = realNow;
        _readingsCoveredTo = coveredTo;
        if (covering is not null)
        {
            _lastCoveredAt = now;
            _uncoveredStored = false;
        }
        return committed;
    }

    public static string Describe(Exception ex) => $"{ex.GetType().Name}: {(ex.InnerException ?? ex).Message.ReplaceLineEndings(" ")}";

    /// <summary>Storage failed: from now on nothing is evaluated or acknowledged until a write succeeds again.</summary>
    public void StopRecording(DateTimeOffset now, string error, Exception ex)
    {
        if (Error is null)
        {
            FailingSince = now;
            _refusedBatches = 0;
            _refusedReadings = 0;
            logger.LogError(ex, "NOT RECORDING since {Since}: {Error}; readings are refused and actions not applied until storage works again", now, error);
        }
        Error = error;
    }

    /// <summary>Answers each batch's sender that its readings were not taken, with <paramref name="reason"/>.</summary>
    public void Refuse(IReadOnlyList<ReadingBatch> batches, string reason)
    {
        foreach (var batch in batches)
        {
            batch.Receipt?.Refuse(reason);
            if (batch.InboxId is not null)
            {
                // a batch from the reading inbox is not refused: it stays queued and is taken again after the gap
                // (docs/engine.md R74), so counting it at each retry would put refusals on record that never happened
                continue;
            }
            _refusedBatches++;
            _refusedReadings += batch.Readings.Count;
        }
    }

    /// <summary>
    /// While not recording, each evaluation (at most one a second, but every command) first tries to write the gap's one audit entry
    /// (start, end, reason, what was refused) together with the state rebased at <paramref name="now"/>. What the
    /// engine knew from readings before the gap is dropped (latest readings, running dwells, monitoring start), so
    /// the first evaluation after the gap neither stamps events inside it nor counts a dwell across it (docs/reliability.md).
    /// Returns the rebased state once written, else null.
    /// </summary>
    public async Task<EngineState?> TryResumeAsync(EngineState state, string profileVersion, DateTimeOffset now, DateTimeOffset realNow, bool force, CancellationToken cancellationToken)
    {
        if (!force && realNow - _lastResumeAttemptReal < s_resumeRetry)
        {
            return null;
        }
        _lastResumeAttemptReal = realNow;
        var rebased = Rebase(state, now);
        var gap = AuditEvents.HostEntry(AuditEvents.RecordingGap, now, new
        {
            from = FailingSince,
            to = now,
            reason = Error,
            refusedBatches = _refusedBatches,
            refusedReadings = _refusedReadings,
        });
        try
        {
            await audit.AppendFencedAsync([gap], new EngineStateWrite(EngineStateJson.Serialize(rebased), profileVersion, now), _epoch, cancellationToken);
        }
        catch (StaleEpochException)
        {
            throw;
        }
        catch (Exception ex) when (ex is not OperationCanceledException || !cancellationToken.IsCancellationRequested)
        {
            Error = ex is AuditCommitException ? ex.Message : Describe(ex);
            logger.LogDebug(ex, "Still not recording: {Error}", Error);
            return null;
        }
        logger.LogWarning("Recording resumed: gap from {From} to {To} ({Batches} batch(es), {Readings} reading(s) refused)", FailingSince, now, _refusedBatches, _refusedReadings);
        _written = rebased;
        _lastWriteReal = realNow;
        Error = null;
        FailingSince = null;
        try
        {
            // the WAL grew (or failed to) during the outage; fold it back into the database now there is room
            await audit.CheckpointAsync(cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            logger.LogWarning(ex, "WAL checkpoint after the recording gap failed");
        }
        return rebased;
    }

    /// <summary>The state as known right after a recording gap: no readings and no running dwell from before it.</summary>
    public static EngineState Rebase(EngineState state, DateTimeOffset now) => state with
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
}
