using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Optics;
using OpsLvp.Core.Profile;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Anchors;
using OpsLvp.Web.Hosting;

namespace OpsLvp.Web.Engine;

/// <summary>
/// Start-up and restore of the engine host (DEVELOPERS.md "Data flow"; docs/engine.md R7, R12): migrate and check the
/// database, load the validated profile, and restore the persisted engine state (restart recovery: phase, episode,
/// holds, pending, items and running dwells, which are start instants) after checking it against the audit chain and
/// its seal. The host then evaluates at "now" with the returned entries, so dwells that completed while the server
/// was down fire at their exact instants.
/// </summary>
internal sealed class EngineStartup(
    IOptions<EngineOptions> options,
    ContentPaths paths,
    IDbContextFactory<OpsLvpDbContext> dbFactory,
    AuditStore audit,
    ReadingStore readingStore,
    TamperCheck tamper,
    ILogger logger)
{
    /// <summary>Migrates and checks the database; returns the journal mode it switched from (SQLite), else null.</summary>
    /// <exception cref="InvalidOperationException">The database could not be migrated or is not durable.</exception>
    public async Task<string?> MigrateAsync(CancellationToken cancellationToken)
    {
        try
        {
            return await DatabaseStartup.MigrateAndCheckAsync(dbFactory, cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            logger.LogCritical(ex, "OpsLvp cannot start: the database could not be migrated or is not durable: {Error}", ex.Message);
            throw new InvalidOperationException($"OpsLvp cannot start: the database could not be migrated or is not durable (WAL + synchronous=FULL): {ex.Message}", ex);
        }
    }

    /// <summary>The validated profile of <c>Engine:ProfilePath</c>.</summary>
    /// <exception cref="InvalidOperationException">It is missing or not valid.</exception>
    public AerodromeProfile LoadProfile()
    {
        var path = paths.Resolve(options.Value.ProfilePath);
        try
        {
            return ProfileValidator.LoadValidated(path);
        }
        catch (Exception ex) when (ex is ProfileException or IOException or UnauthorizedAccessException)
        {
            logger.LogCritical("OpsLvp cannot start: Engine:ProfilePath '{Path}': {Error}", path, ex.Message);
            throw new InvalidOperationException($"OpsLvp cannot start: Engine:ProfilePath '{path}': {ex.Message}", ex);
        }
    }

    /// <summary>
    /// Restores the engine state stored in the database for <paramref name="profile"/> at <paramref name="now"/>, with
    /// the host's entries for the first evaluation (<c>engine_started</c>, an acknowledged mismatch, a journal mode
    /// switch, the profile when it is not the one last recorded).
    /// </summary>
    public async Task<EngineRestore> RestoreAsync(AerodromeProfile profile, DateTimeOffset now, string? switchedFrom, CancellationToken cancellationToken)
    {
        var o = options.Value;
        var run = new EngineRun(new LvpEngine(profile), new RvrDerivation(profile), new RvrTrends(profile));
        var persisted = await audit.GetLatestStateAsync(cancellationToken);
        var restored = false;
        NewAuditEntry? acknowledged = null;
        EngineState? state = null;
        if ((await StateMismatchAsync(persisted, cancellationToken) ?? await tamper.CheckAsync(persisted, cancellationToken)) is { } mismatch)
        {
            if (o.AcknowledgeStateMismatch != mismatch.Head)
            {
                var stopped = $"{mismatch.Text}; the engine stays stopped until an administrator acknowledges it (restart with Engine:AcknowledgeStateMismatch={mismatch.Head})";
                logger.LogCritical("OpsLvp engine stopped: {Reason}", stopped);
                return new EngineRestore(stopped, null, null, null, [], false, 0);
            }
            logger.LogWarning("State mismatch acknowledged by Engine:AcknowledgeStateMismatch={Head}: {Mismatch}; starting from the initial state", mismatch.Head, mismatch.Text);
            acknowledged = AuditEvents.HostEntry("state_mismatch_acknowledged", now, new { mismatch = mismatch.Text, head = mismatch.Head });
            persisted = null;
        }
        if (persisted is not null)
        {
            try
            {
                state = EngineStateJson.Deserialize(persisted.StateJson);
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
        state ??= run.Engine.Initial(now);
        // the restored setting applies to raw readings from its instant on, as it did live (docs/engine.md R20)
        run.Derivation.ManualStep = state.ManualLightStep;
        await RebuildAveragingAsync(run, now, cancellationToken);
        var started = AuditEvents.HostEntry("engine_started", now, new
        {
            profile = profile.Version,
            restored,
            restoredPhase = restored ? state.Phase.ToString() : null,
            stateEvaluatedAt = restored ? state.EvaluatedAt : (DateTimeOffset?)null,
        });
        logger.LogInformation("Engine host started with profile {Profile}; state {How} (phase {Phase})", profile.Version, restored ? "restored" : "initial", state.Phase);
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
        var coveredTo = await tamper.ReadingsCoveredToAsync(cancellationToken);
        return new EngineRestore(null, run, state, restored ? state : null, hostEntries, acknowledged is not null, coveredTo);
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
    private async Task RebuildAveragingAsync(EngineRun run, DateTimeOffset now, CancellationToken cancellationToken)
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
                _ = run.Derivation.Observe(reading);
            }
            if (row.Accepted)
            {
                run.Trends.Add(reading);
            }
        }
    }
}
