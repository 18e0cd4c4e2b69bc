using Microsoft.EntityFrameworkCore;
using Npgsql;
using NpgsqlTypes;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>
/// The <c>reading_inbox</c> queue (docs/deployment.md "Readings from any node"; docs/engine.md R73–R75): a standby
/// stores a pushed batch here, durably, before it answers 202, and wakes the leader with <c>NOTIFY</c> on
/// <see cref="NotifyChannel"/>; the leader reads the rows in id order and deletes them in the transaction that stores
/// their readings (<see cref="ReadingStore.InsertAsync(IReadOnlyList{ReceivedReading}, InboxClaim?, CancellationToken)"/>).
/// PostgreSQL only: on SQLite (one node) nothing is ever queued.
/// </summary>
public sealed class ReadingInboxStore(IDbContextFactory<OpsLvpDbContext> factory)
{
    /// <summary>The channel a standby notifies after queueing a batch.</summary>
    public const string NotifyChannel = "opslvp_readings";

    private const string EnqueueSql =
        "INSERT INTO reading_inbox (received_at, source, node_id, body, accepted, rejected) VALUES ($1, $2, $3, $4, $5, $6) RETURNING id";

    private const string EnqueueBoundedSql =
        "INSERT INTO reading_inbox (received_at, source, node_id, body, accepted, rejected) SELECT $1, $2, $3, $4, $5, $6 "
        + "WHERE (SELECT count(*) FROM reading_inbox) < $7 RETURNING id";

    private const string CountSql = "SELECT count(*) FROM reading_inbox";

    private const string NotifySql = "SELECT pg_notify('" + NotifyChannel + "', $1)";

    // one statement: the epoch check (a share lock on the leadership row, so a takeover's increment waits for it or is
    // seen, as the readings insert's claim does), the count and the error; the epoch on record comes back either way
    private const string FailedAttemptSql =
        "WITH fence AS (SELECT epoch FROM engine_leadership WHERE id = 1 FOR SHARE), "
        + "counted AS (UPDATE reading_inbox SET attempts = attempts + 1, last_error = $2 "
        + "WHERE id = $1 AND EXISTS (SELECT 1 FROM fence WHERE epoch = $3) RETURNING attempts) "
        + "SELECT (SELECT epoch FROM fence), (SELECT attempts FROM counted)";

    private readonly ProviderProbe _provider = new(factory);

    /// <summary>True when the database is PostgreSQL, the only provider with several nodes and so with an inbox.</summary>
    public bool IsAvailable => _provider.IsPostgres;

    /// <summary>
    /// Stores <paramref name="row"/> and notifies <see cref="NotifyChannel"/> in one transaction: when this returns the
    /// batch is committed (<c>synchronous_commit</c> is checked at start), and the notification is sent with the commit.
    /// Returns the row's id.
    /// </summary>
    /// <exception cref="InvalidOperationException">The database is not PostgreSQL.</exception>
    public async Task<long> EnqueueAsync(ReadingInboxRow row, CancellationToken cancellationToken = default) =>
        (await TryEnqueueAsync(row, int.MaxValue, cancellationToken)).Id!.Value;

    /// <summary>
    /// As <see cref="EnqueueAsync"/>, unless <paramref name="maxBatches"/> batches or more wait already: then nothing is
    /// stored and the answer has no id and how many wait (docs/engine.md R80). The count is taken by the insert itself,
    /// so pushes to several standbys at the same instant can each see room for one more: the inbox may exceed the limit
    /// by the pushes in flight at that instant, never more.
    /// </summary>
    /// <exception cref="InvalidOperationException">The database is not PostgreSQL.</exception>
    public async Task<(long? Id, int Waiting)> TryEnqueueAsync(ReadingInboxRow row, int maxBatches, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(row);
        ArgumentOutOfRangeException.ThrowIfLessThan(maxBatches, 1);
        if (!IsAvailable)
        {
            throw new InvalidOperationException("the reading inbox is used with PostgreSQL only (several nodes)");
        }
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        await db.Database.OpenConnectionAsync(cancellationToken);
        var connection = (NpgsqlConnection)db.Database.GetDbConnection();
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        long id;
        var bounded = maxBatches < int.MaxValue;
        await using (var insert = new NpgsqlCommand(bounded ? EnqueueBoundedSql : EnqueueSql, connection, transaction))
        {
            insert.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Text, Value = UtcTextConverter.Format(row.ReceivedAt) });
            insert.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Text, Value = row.Source });
            insert.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Text, Value = row.NodeId });
            insert.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Text, Value = row.Body });
            insert.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Integer, Value = row.Accepted });
            insert.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Integer, Value = row.Rejected });
            if (bounded)
            {
                insert.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Bigint, Value = (long)maxBatches });
            }
            if (await insert.ExecuteScalarAsync(cancellationToken) is not long inserted)
            {
                await transaction.RollbackAsync(cancellationToken);
                await using var count = new NpgsqlCommand(CountSql, connection);
                var waiting = (long)(await count.ExecuteScalarAsync(cancellationToken))!;
                return (null, (int)Math.Min(waiting, int.MaxValue));
            }
            id = inserted;
        }
        await using (var notify = new NpgsqlCommand(NotifySql, connection, transaction))
        {
            notify.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Text, Value = id.ToString(System.Globalization.CultureInfo.InvariantCulture) });
            await notify.ExecuteNonQueryAsync(cancellationToken);
        }
        await transaction.CommitAsync(cancellationToken);
        row.Id = id;
        return (id, 0);
    }

    /// <summary>
    /// Records a failed attempt to evaluate batch <paramref name="id"/> alone (docs/engine.md R82): adds one to the row's
    /// <c>attempts</c> and keeps <paramref name="error"/> (the caller clips it) as its <c>last_error</c>, in one statement
    /// fenced by the leader's <paramref name="epoch"/>, and returns the attempts counted so far by every leader. Null when
    /// the row is gone (another node took or set it aside).
    /// </summary>
    /// <exception cref="StaleEpochException"><paramref name="epoch"/> is not the current one: nothing was counted.</exception>
    /// <exception cref="InvalidOperationException">The database is not PostgreSQL.</exception>
    public async Task<int?> RecordFailedAttemptAsync(long id, string error, long epoch, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(error);
        if (!IsAvailable)
        {
            throw new InvalidOperationException("the reading inbox is used with PostgreSQL only (several nodes)");
        }
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        await db.Database.OpenConnectionAsync(cancellationToken);
        var connection = (NpgsqlConnection)db.Database.GetDbConnection();
        await using var command = new NpgsqlCommand(FailedAttemptSql, connection);
        command.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Bigint, Value = id });
        command.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Text, Value = error });
        command.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = NpgsqlDbType.Bigint, Value = epoch });
        await using var reader = await command.ExecuteReaderAsync(cancellationToken);
        await reader.ReadAsync(cancellationToken);
        long? current = reader.IsDBNull(0) ? null : reader.GetInt64(0);
        if (current != epoch)
        {
            throw new StaleEpochException(epoch, current);
        }
        return reader.IsDBNull(1) ? null : reader.GetInt32(1);
    }

    /// <summary>The first <paramref name="limit"/> waiting rows, oldest (lowest id) first.</summary>
    public async Task<IReadOnlyList<ReadingInboxRow>> PeekAsync(int limit, CancellationToken cancellationToken = default)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(limit, 1);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        return await db.ReadingInbox.AsNoTracking().OrderBy(r => r.Id).Take(limit).ToListAsync(cancellationToken);
    }

    /// <summary>How many batches wait, and when the oldest of them was received (null when none waits).</summary>
    public async Task<(int Batches, DateTimeOffset? OldestReceivedAt)> WaitingAsync(CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var count = await db.ReadingInbox.CountAsync(cancellationToken);
        if (count == 0)
        {
            return (0, null);
        }
        var oldest = await db.ReadingInbox.AsNoTracking().OrderBy(r => r.Id).Select(r => (DateTimeOffset?)r.ReceivedAt).FirstOrDefaultAsync(cancellationToken);
        return (count, oldest);
    }
}
