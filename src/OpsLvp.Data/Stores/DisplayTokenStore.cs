using System.Linq.Expressions;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>Named, revocable, read-only wall links for kiosks, stored as SHA-256 of the token.</summary>
public sealed class DisplayTokenStore(IDbContextFactory<OpsLvpDbContext> factory)
    : SecretRecordStore<DisplayTokenRow>(factory, Prefix)
{
    public const string Prefix = "opd_";

    /// <exception cref="ArgumentException">The name is empty or longer than 100 characters.</exception>
    public Task<IssuedCredential> IssueAsync(string name, string createdBy, DateTimeOffset now, CancellationToken cancellationToken = default)
    {
        var trimmed = CredentialNames.Check(name);
        var secret = NewSecret();
        var row = new DisplayTokenRow { Name = trimmed, TokenHash = SecretHash.Hash(secret), CreatedBy = createdBy, CreatedAt = now };
        return AddAsync(row, secret, cancellationToken);
    }

    protected override DbSet<DisplayTokenRow> Rows(OpsLvpDbContext db) => db.DisplayTokens;

    protected override Expression<Func<DisplayTokenRow, bool>> ActiveWithHash(string hash) => t => t.TokenHash == hash && t.RevokedAt == null;

    protected override Expression<Func<DisplayTokenRow, bool>> ActiveWithId(long id) => t => t.Id == id && t.RevokedAt == null;

    protected override Expression<Func<DisplayTokenRow, long>> ById => t => t.Id;

    protected override AccessCredential ToCredential(DisplayTokenRow row) =>
        new(row.Id, row.Name, [], row.CreatedBy, row.CreatedAt, row.RevokedAt, row.LastUsedAt);
}
