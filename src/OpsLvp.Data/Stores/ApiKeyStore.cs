using System.Linq.Expressions;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>Named, scoped, revocable API keys for machine clients, stored as SHA-256 of the key.</summary>
public sealed class ApiKeyStore(IDbContextFactory<OpsLvpDbContext> factory)
    : SecretRecordStore<ApiKeyRow>(factory, Prefix)
{
    public const string Prefix = "opk_";

    /// <summary>Push readings to <c>POST /api/readings</c>.</summary>
    public const string IngestScope = "ingest";

    /// <summary>Receive state snapshots on the hub.</summary>
    public const string HubReadScope = "hub-read";

    public static IReadOnlyList<string> KnownScopes { get; } = [IngestScope, HubReadScope];

    /// <exception cref="ArgumentException">Bad name, no scope, or an unknown scope (the message names it).</exception>
    public Task<IssuedCredential> IssueAsync(string name, IEnumerable<string> scopes, string createdBy, DateTimeOffset now, CancellationToken cancellationToken = default)
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
        var secret = NewSecret();
        var row = new ApiKeyRow { Name = trimmed, KeyHash = SecretHash.Hash(secret), Scopes = string.Join(' ', scopeList), CreatedBy = createdBy, CreatedAt = now };
        return AddAsync(row, secret, cancellationToken);
    }

    public async Task<bool> AnyActiveAsync(string scope, CancellationToken cancellationToken = default)
    {
        await using var db = await Factory.CreateDbContextAsync(cancellationToken);
        var scopes = await db.ApiKeys.AsNoTracking().Where(k => k.RevokedAt == null).Select(k => k.Scopes).ToListAsync(cancellationToken);
        return scopes.Any(s => s.Split(' ').Contains(scope));
    }

    protected override DbSet<ApiKeyRow> Rows(OpsLvpDbContext db) => db.ApiKeys;

    protected override Expression<Func<ApiKeyRow, bool>> ActiveWithHash(string hash) => k => k.KeyHash == hash && k.RevokedAt == null;

    protected override Expression<Func<ApiKeyRow, bool>> ActiveWithId(long id) => k => k.Id == id && k.RevokedAt == null;

    protected override Expression<Func<ApiKeyRow, long>> ById => k => k.Id;

    protected override AccessCredential ToCredential(ApiKeyRow row) =>
        new(row.Id, row.Name, row.Scopes.Split(' ', StringSplitOptions.RemoveEmptyEntries), row.CreatedBy, row.CreatedAt, row.RevokedAt, row.LastUsedAt);
}
