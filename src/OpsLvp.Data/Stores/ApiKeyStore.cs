using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>Named, scoped, revocable API keys for machine clients, stored as SHA-256 of the key.</summary>
public sealed class ApiKeyStore(IDbContextFactory<OpsLvpDbContext> factory)
{
    public const string Prefix = "opk_";

    /// <summary>Push readings to <c>POST /api/readings</c>.</summary>
    public const string IngestScope = "ingest";

    /// <summary>Receive state snapshots on the hub.</summary>
    public const string HubReadScope = "hub-read";

    public static IReadOnlyList<string> KnownScopes { get; } = [IngestScope, HubReadScope];

    /// <exception cref="ArgumentException">Bad name, no scope, or an unknown scope (the message names it).</exception>
    public async Task<IssuedCredential> IssueAsync(string name, IEnumerable<string> scopes, string createdBy, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        var trimmed = CredentialNames.Check(name);
        var scopeList = scopes.Select(s => s.Trim()).Where(s => s.Length > 0).Distinct(StringComparer.Ordinal).ToList();
        if (scopeList.Count == 0)
        {
            throw new ArgumentException($"at least one scope is required ({string.Join(", ", KnownScopes)})", nameof(scopes));
        }
        foreach (var scope in scopeList.Where(s => !KnownScopes.Contains(s)))
        {
            throw new ArgumentException($"unknown scope '{scope}' (known: {string.Join(", ", KnownScopes)})", nameof(scopes));
        }
        var secret = SecretHash.NewSecret(Prefix);
        var row = new ApiKeyRow { Name = trimmed, KeyHash = SecretHash.Hash(secret), Scopes = string.Join(' ', scopeList), CreatedBy = createdBy, CreatedAt = now };
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        db.ApiKeys.Add(row);
        await db.SaveChangesAsync(cancellationToken);
        return new IssuedCredential(ToCredential(row), secret);
    }

    /// <summary>The active key matching <paramref name="secret"/>, recording its use; null when unknown or revoked.</summary>
    public async Task<AccessCredential?> FindActiveAsync(string secret, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        if (string.IsNullOrEmpty(secret) || !secret.StartsWith(Prefix, StringComparison.Ordinal))
        {
            return null;
        }
        var hash = SecretHash.Hash(secret);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.ApiKeys.SingleOrDefaultAsync(k => k.KeyHash == hash && k.RevokedAt == null, cancellationToken);
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
        return await db.ApiKeys.AnyAsync(k => k.Id == id && k.RevokedAt == null, cancellationToken);
    }

    public async Task<bool> AnyActiveAsync(string scope, CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var scopes = await db.ApiKeys.AsNoTracking().Where(k => k.RevokedAt == null).Select(k => k.Scopes).ToListAsync(cancellationToken);
        return scopes.Any(s => s.Split(' ').Contains(scope));
    }

    /// <summary>Revokes the key; false when there is no such active key.</summary>
    public async Task<bool> RevokeAsync(long id, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var row = await db.ApiKeys.SingleOrDefaultAsync(k => k.Id == id && k.RevokedAt == null, cancellationToken);
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
        var rows = await db.ApiKeys.AsNoTracking().OrderBy(k => k.Id).ToListAsync(cancellationToken);
        return rows.ConvertAll(ToCredential);
    }

    private static AccessCredential ToCredential(ApiKeyRow row) =>
        new(row.Id, row.Name, row.Scopes.Split(' ', StringSplitOptions.RemoveEmptyEntries), row.CreatedBy, row.CreatedAt, row.RevokedAt, row.LastUsedAt);
}
