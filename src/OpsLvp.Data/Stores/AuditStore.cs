using System.Data.Common;
using System.Globalization;
using System.Text.Json;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>
/// The audit log in the database (DESIGN R12). Appends are serialised: within the process by a single-writer
/// lock, across processes by SQLite's write lock (the transaction begins IMMEDIATE) and, as a last guard, by the
/// primary key on <c>sequence</c>. Each append reads the chain head, adds the entries and (if given) replaces the
/// engine state row in one transaction, so after a crash the state and the chain never disagree.
/// </summary>
/// <remarks>
/// Appends go through one long-lived writer connection, opened through the context options (so the connection
/// pragmas of <see cref="SqlitePragmaInterceptor"/> run once on it) and checked for WAL, with three prepared
/// statements (head, insert, state upsert). The head is read inside each transaction, after the write lock is
/// taken, so another writer (another store or process) can never leave this one with a stale head. After any
/// failure the writer connection is thrown away and the next append opens a fresh one. EF keeps the model,
/// the migrations and the reads.
/// </remarks>
public sealed class AuditStore(IDbContextFactory<OpsLvpDbContext> factory) : IDisposable
{
    private const string HeadSql =
        "SELECT sequence, time, actor, kind, payload_json, previous_hash, hash FROM audit_entries ORDER BY sequence DESC LIMIT 1;";

    private const string InsertSql =
        "INSERT INTO audit_entries (sequence, time, actor, kind, payload_json, previous_hash, hash) VALUES ($s, $t, $a, $k, $p, $ph, $h);";

    private const string StateSql =
        "INSERT INTO engine_state (id, state_json, audit_sequence, profile_version, saved_at) VALUES ($id, $j, $q, $v, $at) "
        + "ON CONFLICT (id) DO UPDATE SET state_json = excluded.state_json, audit_sequence = excluded.audit_sequence, "
        + "profile_version = excluded.profile_version, saved_at = excluded.saved_at;";

    private readonly SemaphoreSlim _writeLock = new(1, 1);

    private Writer? _writer;

    private bool _disposed;

    /// <summary>
    /// Appends <paramref name="entries"/> in order and, if <paramref name="state"/> is given, stores it as the engine
    /// state with the sequence of the last appended entry (or the current head when there are none).
    /// Returns the entries as committed. When this returns, the entries are durable (synchronous=FULL).
    /// </summary>
    /// <exception cref="ArgumentException">An entry has an empty actor or kind or a payload that is not JSON, or the state is not JSON.</exception>
    /// <exception cref="AuditCommitException">The database refused or failed the commit: nothing was written; do not apply the action.</exception>
    public async Task<IReadOnlyList<AuditEntry>> AppendAsync(IReadOnlyList<NewAuditEntry> entries, EngineStateWrite? state = null, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(entries);
        foreach (var entry in entries)
        {
            ArgumentNullException.ThrowIfNull(entry);
            _ = AuditCanonical.EntryBytes(1, entry.Time, entry.Actor, entry.Kind, entry.PayloadJson);
        }
        if (state is not null)
        {
            CheckState(state);
        }
        if (entries.Count == 0 && state is null)
        {
            return [];
        }

        await _writeLock.WaitAsync(cancellationToken);
        try
        {
            ObjectDisposedException.ThrowIf(_disposed, this);
            cancellationToken.ThrowIfCancellationRequested();
            var writer = _writer ??= await Writer.OpenAsync(factory, cancellationToken);
            try
            {
                return writer.Append(entries, state);
            }
            catch
            {
                // Whatever state the connection is in after a failure, the next append starts on a fresh one.
                _writer = null;
                writer.Dispose();
                throw;
            }
        }
        catch (Exception ex) when (ex is DbUpdateException or DbException or InvalidOperationException)
        {
            throw new AuditCommitException($"audit entries not committed: {(ex.InnerException ?? ex).Message.ReplaceLineEndings(" ")}", ex);
        }
        finally
        {
            _writeLock.Release();
        }
    }

    /// <summary>The last committed entry, or null for an empty chain.</summary>
    public async Task<AuditEntry?> GetHeadAsync(CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.AuditEntries.AsNoTracking().OrderByDescending(e => e.Sequence).FirstOrDefaultAsync(cancellationToken);
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
        return row is null ? null : new PersistedEngineState(row.StateJson, row.AuditSequence, row.ProfileVersion, row.SavedAt);
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

    public void Dispose()
    {
        if (_disposed)
        {
            return;
        }
        _writeLock.Wait();
        try
        {
            _disposed = true;
            _writer?.Dispose();
            _writer = null;
        }
        finally
        {
            _writeLock.Release();
        }
        _writeLock.Dispose();
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

    /// <summary>The writer connection (owned by a context so the configured interceptors ran on it) and its prepared statements.</summary>
    private sealed class Writer : IDisposable
    {
        private readonly OpsLvpDbContext _context;
        private readonly SqliteConnection _connection;
        private readonly SqliteCommand _head;
        private readonly SqliteCommand _insert;
        private readonly SqliteCommand _state;

        private Writer(OpsLvpDbContext context, SqliteConnection connection)
        {
            _context = context;
            _connection = connection;
            _head = Prepare(HeadSql);
            _insert = Prepare(InsertSql, "$s", "$t", "$a", "$k", "$p", "$ph", "$h");
            _state = Prepare(StateSql, "$id", "$j", "$q", "$v", "$at");
        }

        /// <exception cref="InvalidOperationException">The connection is not SQLite or not in WAL mode.</exception>
        public static async Task<Writer> OpenAsync(IDbContextFactory<OpsLvpDbContext> factory, CancellationToken cancellationToken)
        {
            var context = await factory.CreateDbContextAsync(cancellationToken);
            try
            {
                await context.Database.OpenConnectionAsync(cancellationToken);
                if (context.Database.GetDbConnection() is not SqliteConnection connection)
                {
                    throw new InvalidOperationException("the audit store needs a SQLite connection.");
                }
                using (var check = connection.CreateCommand())
                {
                    check.CommandText = "PRAGMA journal_mode;";
                    var journalMode = Convert.ToString(check.ExecuteScalar(), CultureInfo.InvariantCulture);
                    if (!string.Equals(journalMode, "wal", StringComparison.OrdinalIgnoreCase))
                    {
                        throw new InvalidOperationException($"SQLite PRAGMA journal_mode is '{journalMode}' on the audit writer connection, expected 'wal'.");
                    }
                    check.CommandText = "PRAGMA synchronous;";
                    var synchronous = Convert.ToInt64(check.ExecuteScalar(), CultureInfo.InvariantCulture);
                    if (synchronous == 0)
                    {
                        throw new InvalidOperationException("SQLite PRAGMA synchronous is OFF on the audit writer connection.");
                    }
                }
                return new Writer(context, connection);
            }
            catch
            {
                await context.DisposeAsync();
                throw;
            }
        }

        public List<AuditEntry> Append(IReadOnlyList<NewAuditEntry> entries, EngineStateWrite? state)
        {
            using var transaction = _connection.BeginTransaction(deferred: false);
            _head.Transaction = transaction;
            _insert.Transaction = transaction;
            _state.Transaction = transaction;
            var previous = ReadHead();
            var appended = new List<AuditEntry>(entries.Count);
            foreach (var entry in entries)
            {
                previous = AuditChain.Append(previous, entry.Time, entry.Actor, entry.Kind, entry.PayloadJson);
                appended.Add(previous);
                var p = _insert.Parameters;
                p[0].Value = previous.Sequence;
                p[1].Value = AuditCanonical.FormatTime(previous.Time);
                p[2].Value = previous.Actor;
                p[3].Value = previous.Kind;
                p[4].Value = previous.PayloadJson;
                p[5].Value = previous.PreviousHash;
                p[6].Value = previous.Hash;
                _insert.ExecuteNonQuery();
            }
            if (state is not null)
            {
                var p = _state.Parameters;
                p[0].Value = EngineStateRow.SingleId;
                p[1].Value = state.StateJson;
                p[2].Value = previous?.Sequence ?? 0;
                p[3].Value = state.ProfileVersion;
                p[4].Value = UtcTextConverter.Format(state.SavedAt);
                _state.ExecuteNonQuery();
            }
            // Once COMMIT is under way the outcome must be the one reported; a failed commit throws and rolls back.
            transaction.Commit();
            return appended;
        }

        public void Dispose()
        {
            _head.Dispose();
            _insert.Dispose();
            _state.Dispose();
            _context.Dispose();
        }

        private AuditEntry? ReadHead()
        {
            using var reader = _head.ExecuteReader();
            if (!reader.Read())
            {
                return null;
            }
            return new AuditEntry(
                reader.GetInt64(0),
                UtcTextConverter.Parse(reader.GetString(1)),
                reader.GetString(2),
                reader.GetString(3),
                reader.GetString(4),
                reader.GetString(5),
                reader.GetString(6));
        }

        private SqliteCommand Prepare(string sql, params string[] parameters)
        {
            var command = _connection.CreateCommand();
            command.CommandText = sql;
            foreach (var name in parameters)
            {
                command.Parameters.Add(new SqliteParameter { ParameterName = name });
            }
            return command;
        }
    }
}
