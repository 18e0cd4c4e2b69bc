using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>The <c>feed_health</c> table, one row per feed.</summary>
public sealed class FeedHealthStore(IDbContextFactory<OpsLvpDbContext> factory)
{
    /// <summary>A good poll: sets last good and resets the failure count (the last error is kept for review).</summary>
    public Task RecordSuccessAsync(string feed, DateTimeOffset at, CancellationToken cancellationToken = default) =>
        UpdateAsync(feed, row =>
        {
            row.LastGoodAt = at;
            row.ConsecutiveFailures = 0;
        }, cancellationToken);

    /// <summary>A failed poll: counts it and keeps the error text.</summary>
    public Task RecordFailureAsync(string feed, DateTimeOffset at, string error, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(error);
        return UpdateAsync(feed, row =>
        {
            row.ConsecutiveFailures++;
            row.LastError = error;
            row.LastErrorAt = at;
        }, cancellationToken);
    }

    public async Task<IReadOnlyList<FeedHealth>> GetAllAsync(CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var rows = await db.FeedHealth.AsNoTracking().OrderBy(f => f.Feed).ToListAsync(cancellationToken);
        return rows.ConvertAll(f => new FeedHealth(f.Feed, f.LastGoodAt, f.ConsecutiveFailures, f.LastError, f.LastErrorAt));
    }

    private async Task UpdateAsync(string feed, Action<FeedHealthRow> change, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(feed);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        await using var transaction = await db.Database.BeginTransactionAsync(cancellationToken);
        var row = await db.FeedHealth.FindAsync([feed], cancellationToken);
        if (row is null)
        {
            row = new FeedHealthRow { Feed = feed };
            db.FeedHealth.Add(row);
        }
        change(row);
        await db.SaveChangesAsync(cancellationToken);
        await transaction.CommitAsync(cancellationToken);
    }
}
