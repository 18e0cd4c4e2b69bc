using System.Collections.Concurrent;
using System.Linq.Expressions;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>
/// What API keys and display tokens share: a secret with a fixed prefix, stored only as its SHA-256, found while
/// active (recording its use to the minute), revoked by id, listed by id.
/// <para>A found record is remembered for <see cref="RememberFor"/> (real time), so a feed pushing every few
/// seconds does not cost a database query per request (about a millisecond each in the server). Revoking through
/// this store forgets the record at once; a row changed in the database by anything else is seen within
/// <see cref="RememberFor"/>.</para>
/// </summary>
/// <typeparam name="TRow">The row type; the derived store says which set holds it and which column has the hash.</typeparam>
public abstract class SecretRecordStore<TRow>(IDbContextFactory<OpsLvpDbContext> factory, string prefix)
    where TRow : class, ISecretRow
{
    /// <summary>How long a found record is trusted without asking the database again.</summary>
    public static readonly TimeSpan DefaultRememberFor = TimeSpan.FromSeconds(10);

    private readonly ConcurrentDictionary<string, Remembered> _found = new(StringComparer.Ordinal);

    // Counts revocations, so a lookup that raced a revocation does not remember what it read.
    private long _revocations;

    /// <summary>How long a found record is trusted without asking the database again (real time); zero: always ask.</summary>
    public TimeSpan RememberFor { get; init; } = DefaultRememberFor;

    /// <summary>The real-time clock <see cref="RememberFor"/> is measured on (a test's fake clock can replace it).</summary>
    public TimeProvider RealClock { get; init; } = TimeProvider.System;

    /// <summary>Opens a context per operation.</summary>
    protected IDbContextFactory<OpsLvpDbContext> Factory { get; } = factory;

    /// <summary>The rows' set in <paramref name="db"/>.</summary>
    protected abstract DbSet<TRow> Rows(OpsLvpDbContext db);

    /// <summary>Matches the active row whose stored hash is <paramref name="hash"/>.</summary>
    protected abstract Expression<Func<TRow, bool>> ActiveWithHash(string hash);

    /// <summary>Matches the active row with <paramref name="id"/>.</summary>
    protected abstract Expression<Func<TRow, bool>> ActiveWithId(long id);

    /// <summary>Orders rows by id.</summary>
    protected abstract Expression<Func<TRow, long>> ById { get; }

    protected abstract AccessCredential ToCredential(TRow row);

    /// <summary>A new secret with this store's prefix.</summary>
    protected string NewSecret() => SecretHash.NewSecret(prefix);

    /// <summary>Saves a newly issued <paramref name="row"/> and returns it with its one-time <paramref name="secret"/>.</summary>
    protected async Task<IssuedCredential> AddAsync(TRow row, string secret, CancellationToken cancellationToken)
    {
        await using var db = await Factory.CreateDbContextAsync(cancellationToken);
        Rows(db).Add(row);
        await db.SaveChangesAsync(cancellationToken);
        return new IssuedCredential(ToCredential(row), secret);
    }

    /// <summary>The active record matching <paramref name="secret"/>, recording its use; null when unknown or revoked.</summary>
    public async Task<AccessCredential?> FindActiveAsync(string secret, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        if (string.IsNullOrEmpty(secret) || !secret.StartsWith(prefix, StringComparison.Ordinal))
        {
            return null;
        }
        var hash = SecretHash.Hash(secret);
        var at = RealClock.GetTimestamp();
        if (_found.TryGetValue(hash, out var known) && RealClock.GetElapsedTime(known.At, at) < RememberFor && !UseIsDue(known.Credential.LastUsedAt, now))
        {
            return known.Credential;
        }
        var revocations = Interlocked.Read(ref _revocations);
        await using var db = await Factory.CreateDbContextAsync(cancellationToken);
        var row = await Rows(db).SingleOrDefaultAsync(ActiveWithHash(hash), cancellationToken);
        if (row is null)
        {
            _found.TryRemove(hash, out _);
            return null;
        }
        // Recorded to the minute: a busy client should not cost a database write per request.
        if (UseIsDue(row.LastUsedAt, now))
        {
            var previous = row.LastUsedAt;
            row.LastUsedAt = now;
            try
            {
                await db.SaveChangesAsync(cancellationToken);
            }
            catch (Exception ex) when (ex is DbUpdateException or System.Data.Common.DbException)
            {
                // A full or read-only disk must not turn every key holder away (a feed must get 503 "not stored",
                // a screen must read the state): the last-use time is a convenience and is written next time.
                row.LastUsedAt = previous;
            }
        }
        var credential = ToCredential(row);
        if (Interlocked.Read(ref _revocations) == revocations)
        {
            _found[hash] = new Remembered(credential, at);
        }
        return credential;
    }

    public async Task<bool> IsActiveAsync(long id, CancellationToken cancellationToken = default)
    {
        await using var db = await Factory.CreateDbContextAsync(cancellationToken);
        return await Rows(db).AnyAsync(ActiveWithId(id), cancellationToken);
    }

    /// <summary>Revokes the record; false when there is no such active record.</summary>
    public async Task<bool> RevokeAsync(long id, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        await using var db = await Factory.CreateDbContextAsync(cancellationToken);
        var row = await Rows(db).SingleOrDefaultAsync(ActiveWithId(id), cancellationToken);
        if (row is null)
        {
            return false;
        }
        row.RevokedAt = now;
        await db.SaveChangesAsync(cancellationToken);
        Interlocked.Increment(ref _revocations);
        Forget(id);
        return true;
    }

    public async Task<IReadOnlyList<AccessCredential>> ListAsync(CancellationToken cancellationToken = default)
    {
        await using var db = await Factory.CreateDbContextAsync(cancellationToken);
        var rows = await Rows(db).AsNoTracking().OrderBy(ById).ToListAsync(cancellationToken);
        return rows.ConvertAll(ToCredential);
    }

    private static bool UseIsDue(DateTimeOffset? lastUsed, DateTimeOffset now) =>
        lastUsed is not { } last || now - last >= TimeSpan.FromMinutes(1) || now < last;

    private void Forget(long id)
    {
        foreach (var (hash, remembered) in _found)
        {
            if (remembered.Credential.Id == id)
            {
                _found.TryRemove(hash, out _);
            }
        }
    }

    private sealed record Remembered(AccessCredential Credential, long At);
}
