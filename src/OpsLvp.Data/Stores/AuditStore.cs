using System.Data.Common;
using System.Globalization;
using System.Text.Json;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>
/// The audit log in the database (docs/engine.md R12). Appends are serialised: within the process by a single-writer
/// lock, across processes by SQLite's write lock (the transaction begins IMMEDIATE) and, as a last guard, by the
/// primary key on <c>sequence</c>. Each append reads the chain head, adds the entries and (if given) replaces the
/// engine state row in one transaction, so after a crash the state and the chain never disagree.
/// </summary>
/// <remarks>
/// Appends go through one long-lived writer connection (<see cref="SqliteWriter"/>) with three kept statements
/// (head, insert, state upsert). Entries are checked and canonicalised once, before the lock
/// (<see cref="AuditChain.Prepare"/>). The head (sequence and hash) is read inside each transaction, after the
/// write lock is taken, so another writer (another store or process) can never leave this one with a stale head.
/// EF keeps the model, the migrations and the reads.
/// </remarks>
public sealed class AuditStore(IDbContextFactory<OpsLvpDbContext> factory, IStateSealer? sealer = null) : IDisposable
{
    private const string HeadSql = "SELECT sequence, hash FROM audit_entries ORDER BY sequence DESC LIMIT 1;";

    private const string InsertSql =
        "INSERT INTO audit_entries (sequence, time, actor, kind, payload_json, previous_hash, hash) VALUES ($s, $t, $a, $k, $p, $ph, $h);";

    private const string StateSql =
        "INSERT INTO engine_state (id, state_json, audit_sequence, audit_hash, state_signature, profile_version, saved_at) VALUES ($id, $j, $q, $qh, $sg, $v, $at) "
        + "ON CONFLICT (id) DO UPDATE SET state_json = excluded.state_json, audit_sequence = excluded.audit_sequence, "
        + "audit_hash = excluded.audit_hash, state_signature = excluded.state_signature, profile_version = excluded.profile_version, saved_at = excluded.saved_at;";

    private readonly SqliteWriter _writer = new(factory, "audit writer");

    // PostgreSQL's counterpart (docs/deployment.md "PostgreSQL and several nodes"); only one of the two is ever opened.
    private readonly PostgresWriter _postgresWriter = new(factory, "audit writer");

    private readonly ProviderProbe _provider = new(factory);

    /// <summary>
    /// Appends <paramref name="entries"/> in order and, if <paramref name="state"/> is given, stores it as the engine
    /// state with the sequence and hash of the last appended entry (or the current head when there are none).
    /// Returns the entries as committed. When this returns, the entries are durable (synchronous=FULL).
    /// </summary>
    /// <exception cref="ArgumentException">An entry has an empty actor or kind or a payload that is not JSON, or the state is not JSON.</exception>
    /// <exception cref="AuditCommitException">The database refused or failed the commit: nothing was written; do not apply the action.</exception>
    public Task<IReadOnlyList<AuditEntry>> AppendAsync(IReadOnlyList<NewAuditEntry> entries, EngineStateWrite? state = null, CancellationToken cancellationToken = default) =>
        AppendFencedAsync(entries, state, null, cancellationToken);

    /// <summary>
    /// As <see cref="AppendAsync"/>, fenced by a
    /// leadership <paramref name="epoch"/> (docs/engine.md R71): on PostgreSQL the append checks, after taking the audit
    /// lock, that the epoch is the current one in <c>engine_leadership</c> and writes nothing otherwise. Null (and any
    /// epoch on SQLite, which has one node) appends unfenced.
    /// </summary>
    /// <remarks>
    /// With <paramref name="removeInbox"/> (PostgreSQL only) the same transaction deletes those <c>reading_inbox</c> rows
    /// after the epoch check, and writes nothing when any of them is gone: the leader sets a failing batch aside with
    /// its audit entry in one commit (docs/engine.md R82).
    /// </remarks>
    /// <exception cref="StaleEpochException">Another node has taken leadership: nothing was written; stop evaluating.</exception>
    /// <exception cref="InboxClaimLostException">A row of <paramref name="removeInbox"/> is gone: nothing was written.</exception>
    /// <exception cref="AuditCommitException">The database refused or failed the commit: nothing was written; do not apply the action.</exception>
    public async Task<IReadOnlyList<AuditEntry>> AppendFencedAsync(IReadOnlyList<NewAuditEntry> entries, EngineStateWrite? state, long? epoch, CancellationToken cancellationToken = default, IReadOnlyList<long>? removeInbox = null)
    {
        ArgumentNullException.ThrowIfNull(entries);
        var pending = new PendingAuditEntry[entries.Count];
        for (var i = 0; i < pending.Length; i++)
        {
            var entry = entries[i];
            ArgumentNullException.ThrowIfNull(entry);
            pending[i] = AuditChain.Prepare(entry.Time, entry.Actor, entry.Kind, entry.PayloadJson);
        }
        if (state is not null)
        {
            CheckState(state);
        }
        if (pending.Length == 0 && state is null)
        {
            return [];
        }
        if (removeInbox is { Count: > 0 } && !_provider.IsPostgres)
        {
            throw new InvalidOperationException("the reading inbox is used with PostgreSQL only (several nodes)");
        }

        try
        {
            return _provider.IsPostgres
                ? await _postgresWriter.RunAsync((session, ct) => PostgresHotPath.AppendAuditAsync(session, pending, state, sealer, epoch, ct, removeInbox), cancellationToken)
                : await _writer.RunAsync(session => Append(session, pending, state, sealer), cancellationToken);
        }
        catch (Exception ex) when (ex is DbUpdateException or DbException or InvalidOperationException)
        {
            throw new AuditCommitException($"audit entries not committed: {(ex.InnerException ?? ex).Message.ReplaceLineEndings(" ")}", ex);
        }
    }

    /// <summary>The last committed entry, or null for an empty chain.</summary>
    public async Task<AuditEntry?> GetHeadAsync(CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.AuditEntries.AsNoTracking().OrderByDescending(e => e.Sequence).FirstOrDefaultAsync(cancellationToken);
        return row is null ? null : ToEntry(row);
    }

    /// <summary>The last committed entry of <paramref name="kind"/>, or null when there is none.</summary>
    public async Task<AuditEntry?> GetLastOfKindAsync(string kind, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(kind);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.AuditEntries.AsNoTracking().Where(e => e.Kind == kind).OrderByDescending(e => e.Sequence).FirstOrDefaultAsync(cancellationToken);
        return row is null ? null : ToEntry(row);
    }

    /// <summary>The last committed entry whose payload text contains <paramref name="text"/>, or null.</summary>
    public async Task<AuditEntry?> GetLastContainingAsync(string text, CancellationToken cancellationToken = default)
    {
        ArgumentException.ThrowIfNullOrEmpty(text);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.AuditEntries.AsNoTracking().Where(e => e.PayloadJson.Contains(text)).OrderByDescending(e => e.Sequence).FirstOrDefaultAsync(cancellationToken);
        return row is null ? null : ToEntry(row);
    }

    /// <summary>Entries with <paramref name="fromSequence"/> ≤ sequence ≤ <paramref name="toSequence"/>, in sequence order.</summary>
    public async Task<IReadOnlyList<AuditEntry>> GetRangeAsync(long fromSequence, long toSequence, CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var rows = await db.AuditEntries.AsNoTracking()
            .Where(e => e.Sequence >= fromSequence && e.Sequence <= toSequence)
            .OrderBy(e => e.Sequence)
            .ToListAsync(cancellationToken);
        return rows.ConvertAll(ToEntry);
    }

    /// <summary>Entries with <paramref name="from"/> ≤ time &lt; <paramref name="to"/>, in sequence order.</summary>
    public async Task<IReadOnlyList<AuditEntry>> GetByTimeAsync(DateTimeOffset from, DateTimeOffset to, CancellationToken cancellationToken = default)
    {
        var fromText = AuditCanonical.FormatTime(from);
        var toText = AuditCanonical.FormatTime(to);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var rows = await db.AuditEntries.AsNoTracking()
            .Where(e => string.Compare(e.Time, fromText) >= 0 && string.Compare(e.Time, toText) < 0)
            .OrderBy(e => e.Sequence)
            .ToListAsync(cancellationToken);
        return rows.ConvertAll(ToEntry);
    }

    /// <summary>The stored engine state, or null before the first save.</summary>
    public async Task<PersistedEngineState?> GetLatestStateAsync(CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.EngineState.AsNoTracking().SingleOrDefaultAsync(s => s.Id == EngineStateRow.SingleId, cancellationToken);
        return row is null ? null : new PersistedEngineState(row.StateJson, row.AuditSequence, row.ProfileVersion, row.SavedAt, row.AuditHash, row.StateSignature);
    }

    /// <summary>
    /// Verifies the whole stored chain, streaming rows in sequence order (memory does not grow with the chain).
    /// A row whose time text is not in the canonical format counts as a malformed entry.
    /// </summary>
    public async Task<AuditVerification> VerifyAsync(CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var verifier = new AuditChainVerifier();
        await foreach (var row in db.AuditEntries.AsNoTracking().OrderBy(e => e.Sequence).AsAsyncEnumerable().WithCancellation(cancellationToken))
        {
            if (UtcTextConverter.TryParse(row.Time, out _))
            {
                verifier.Observe(ToEntry(row));
            }
            else
            {
                verifier.ObserveUnreadable(row.Sequence, string.Create(CultureInfo.InvariantCulture, $"time '{row.Time}' is not in the canonical format"));
            }
        }
        return verifier.Result;
    }

    /// <summary>
    /// Folds the write-ahead log back into the database and truncates it (<c>PRAGMA wal_checkpoint(TRUNCATE)</c>), e.g.
    /// after a storage outage. Returns false when a reader kept part of it (the next automatic checkpoint finishes).
    /// On PostgreSQL there is nothing to fold (the server manages its own log): true.
    /// </summary>
    public Task<bool> CheckpointAsync(CancellationToken cancellationToken = default) =>
        _provider.IsPostgres ? Task.FromResult(true) : _writer.RunAsync(session =>
        {
            using var command = session.Connection.CreateCommand();
            command.CommandText = "PRAGMA wal_checkpoint(TRUNCATE);";
            using var reader = command.ExecuteReader();
            // columns: busy (0/1), WAL frames, frames checkpointed
            return reader.Read() && reader.GetInt64(0) == 0;
        }, cancellationToken);

    public void Dispose()
    {
        _writer.Dispose();
        _postgresWriter.Dispose();
    }

    private static void CheckState(EngineStateWrite state)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(state.ProfileVersion);
        ArgumentNullException.ThrowIfNull(state.StateJson);
        try
        {
            using var _ = JsonDocument.Parse(state.StateJson);
        }
        catch (JsonException ex)
        {
            throw new ArgumentException($"engine state is not JSON: {ex.Message}", nameof(state), ex);
        }
    }

    private static AuditEntry ToEntry(AuditEntryRow row) =>
        new(row.Sequence, UtcTextConverter.Parse(row.Time), row.Actor, row.Kind, row.PayloadJson, row.PreviousHash, row.Hash);

    private static List<AuditEntry> Append(SqliteWriter.Session session, PendingAuditEntry[] entries, EngineStateWrite? state, IStateSealer? sealer)
    {
        using var transaction = session.Connection.BeginTransaction(deferred: false);
        AuditChainHead? head = null;
        using (var reader = session.Command(HeadSql, transaction).ExecuteReader())
        {
            if (reader.Read())
            {
                head = new AuditChainHead(reader.GetInt64(0), reader.GetString(1));
            }
        }
        var appended = new List<AuditEntry>(entries.Length);
        var insert = session.Command(InsertSql, transaction, "$s", "$t", "$a", "$k", "$p", "$ph", "$h");
        foreach (var entry in entries)
        {
            var next = AuditChain.Append(head, entry);
            appended.Add(next);
            SqliteWriter.Session.Bind(insert, next.Sequence, AuditCanonical.FormatTime(next.Time), next.Actor, next.Kind, next.PayloadJson, next.PreviousHash, next.Hash);
            insert.ExecuteNonQuery();
            head = new AuditChainHead(next.Sequence, next.Hash);
        }
        if (state is not null)
        {
            // sealed inside the transaction: the head it names is the one this commit leaves (docs/audit.md "State seal")
            var signature = sealer?.Seal(head?.Sequence ?? 0, head?.Hash, state.StateJson, state.ProfileVersion);
            var upsert = session.Command(StateSql, transaction, "$id", "$j", "$q", "$qh", "$sg", "$v", "$at");
            SqliteWriter.Session.Bind(upsert, EngineStateRow.SingleId, state.StateJson, head?.Sequence ?? 0, head?.Hash, signature, state.ProfileVersion, UtcTextConverter.Format(state.SavedAt));
            upsert.ExecuteNonQuery();
        }
        // Once COMMIT is under way the outcome must be the one reported; a failed commit throws and rolls back.
        transaction.Commit();
        return appended;
    }
}
