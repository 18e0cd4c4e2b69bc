using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>Named, revocable, read-only wall links for kiosks, stored as SHA-256 of the token.</summary>
public sealed class DisplayTokenStore(IDbContextFactory<OpsLvpDbContext> factory)
{
    public const string Prefix = "opd_";

    /// <exception cref="ArgumentException">The name is empty or longer than 100 characters.</exception>
    public async Task<IssuedCredential> IssueAsync(string name, string createdBy, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        var trimmed = CredentialNames.Check(name);
        var secret = SecretHash.NewSecret(Prefix);
        var row = new DisplayTokenRow { Name = trimmed, TokenHash = SecretHash.Hash(secret), CreatedBy = createdBy, CreatedAt = now };
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        db.DisplayTokens.Add(row);
        await db.SaveChangesAsync(cancellationToken);
        return new IssuedCredential(ToCredential(row), secret);
    }

    /// <summary>The active token matching <paramref name="secret"/>, recording its use; null when unknown or revoked.</summary>
    public async Task<AccessCredential?> FindActiveAsync(string secret, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        if (string.IsNullOrEmpty(secret) || !secret.StartsWith(Prefix, StringComparison.Ordinal))
        {
            return null;
        }
        var hash = SecretHash.Hash(secret);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.DisplayTokens.SingleOrDefaultAsync(t => t.TokenHash == hash && t.RevokedAt == null, cancellationToken);
        if (row is null)
        {
            return null;
        }
        // Recorded to the minute: a busy client should not cost a database write per request.
        if (row.LastUsedAt is not { } last || now - last >= TimeSpan.FromMinutes(1) || now < last)
        {
            row.LastUsedAt = now;
            await db.SaveChangesAsync(cancellationToken);
        }
        return ToCredential(row);
    }

    public async Task<bool> IsActiveAsync(long id, CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        return await db.DisplayTokens.AnyAsync(t => t.Id == id && t.RevokedAt == null, cancellationToken);
    }

    /// <summary>Revokes the token; false when there is no such active token.</summary>
    public async Task<bool> RevokeAsync(long id, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.DisplayTokens.SingleOrDefaultAsync(t => t.Id == id && t.RevokedAt == null, cancellationToken);
        if (row is null)
        {
            return false;
        }
        row.RevokedAt = now;
        await db.SaveChangesAsync(cancellationToken);
        return true;
    }

    public async Task<IReadOnlyList<AccessCredential>> ListAsync(CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var rows = await db.DisplayTokens.AsNoTracking().OrderBy(t => t.Id).ToListAsync(cancellationToken);
        return rows.ConvertAll(ToCredential);
    }

    private static AccessCredential ToCredential(DisplayTokenRow row) =>
        new(row.Id, row.Name, [], row.CreatedBy, row.CreatedAt, row.RevokedAt, row.LastUsedAt);
}
