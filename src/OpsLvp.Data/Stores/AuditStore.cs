using System.Data.Common;
using System.Globalization;
using System.Text.Json;
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
public sealed class AuditStore(IDbContextFactory<OpsLvpDbContext> factory) : IDisposable
{
    private readonly SemaphoreSlim _writeLock = new(1, 1);

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
            await using var db = await factory.CreateDbContextAsync(cancellationToken);
            await using var transaction = await db.Database.BeginTransactionAsync(cancellationToken);
            var headRow = await db.AuditEntries.AsNoTracking().OrderByDescending(e => e.Sequence).FirstOrDefaultAsync(cancellationToken);
            var previous = headRow is null ? null : ToEntry(headRow);
            var appended = new List<AuditEntry>(entries.Count);
            foreach (var entry in entries)
            {
                previous = AuditChain.Append(previous, entry.Time, entry.Actor, entry.Kind, entry.PayloadJson);
                appended.Add(previous);
                db.AuditEntries.Add(ToRow(previous));
            }
            if (state is not null)
            {
                var row = await db.EngineState.FindAsync([EngineStateRow.SingleId], cancellationToken);
                if (row is null)
                {
                    row = new EngineStateRow { StateJson = state.StateJson, ProfileVersion = state.ProfileVersion };
                    db.EngineState.Add(row);
                }
                row.StateJson = state.StateJson;
                row.ProfileVersion = state.ProfileVersion;
                row.SavedAt = state.SavedAt;
                row.AuditSequence = previous?.Sequence ?? 0;
            }
            await db.SaveChangesAsync(cancellationToken);
            // Not cancellable: once COMMIT is under way the outcome must be the one reported.
            await transaction.CommitAsync(CancellationToken.None);
            return appended;
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

    public void Dispose() => _writeLock.Dispose();

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

    private static AuditEntryRow ToRow(AuditEntry entry) => new()
    {
        Sequence = entry.Sequence,
        Time = AuditCanonical.FormatTime(entry.Time),
        Actor = entry.Actor,
        Kind = entry.Kind,
        PayloadJson = entry.PayloadJson,
        PreviousHash = entry.PreviousHash,
        Hash = entry.Hash,
    };
}
