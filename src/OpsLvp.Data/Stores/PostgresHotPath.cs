using NpgsqlTypes;
using OpsLvp.Core.Audit;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>
/// The PostgreSQL statements of the hot write path (audit append with the engine state; readings insert), run on a
/// <see cref="PostgresWriter"/> session with prepared statements.
/// </summary>
/// <remarks>
/// The audit chain can never fork: each append takes <c>LOCK TABLE audit_entries IN SHARE ROW EXCLUSIVE MODE</c>
/// (one appender at a time across every connection and node; readers are not blocked), reads the head after the
/// lock, and the primary key on <c>sequence</c> refuses a sequence written twice as a last guard.
/// </remarks>
internal static class PostgresHotPath
{
    private const string LockSql = "LOCK TABLE audit_entries IN SHARE ROW EXCLUSIVE MODE";

    private const string EpochSql = "SELECT epoch FROM engine_leadership WHERE id = 1";

    private const string HeadSql = "SELECT sequence, hash FROM audit_entries ORDER BY sequence DESC LIMIT 1";

    private const string InsertAuditSql =
        "INSERT INTO audit_entries (sequence, time, actor, kind, payload_json, previous_hash, hash) VALUES ($1, $2, $3, $4, $5, $6, $7)";

    private const string StateSql =
        "INSERT INTO engine_state (id, state_json, audit_sequence, audit_hash, state_signature, profile_version, saved_at) VALUES ($1, $2, $3, $4, $5, $6, $7) "
        + "ON CONFLICT (id) DO UPDATE SET state_json = excluded.state_json, audit_sequence = excluded.audit_sequence, "
        + "audit_hash = excluded.audit_hash, state_signature = excluded.state_signature, profile_version = excluded.profile_version, saved_at = excluded.saved_at";

    private const string EpochShareSql = "SELECT epoch FROM engine_leadership WHERE id = 1 FOR SHARE";

    private const string DeleteInboxSql = "DELETE FROM reading_inbox WHERE id = ANY($1)";

    private const string InsertReadingSql =
        "INSERT INTO readings (time, received_at, source, sensor, kind, value, status, accepted, reject_reason, reject_detail) "
        + "VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10)";

    /// <summary>
    /// Appends the entries after the current head and stores the state with the new head, in one transaction. With an
    /// <paramref name="epoch"/> (the engine's appends on several nodes), after taking the lock it checks that the epoch
    /// is the current one in <c>engine_leadership</c> and otherwise writes nothing and throws
    /// <see cref="StaleEpochException"/> (docs/engine.md R71): a takeover increments the epoch under the same lock, so
    /// an old leader's append either committed before it or is refused.
    /// </summary>
    /// <remarks>With <paramref name="removeInbox"/> it also deletes those inbox rows, writing nothing when any is gone (docs/engine.md R82).</remarks>
    public static async Task<IReadOnlyList<AuditEntry>> AppendAuditAsync(PostgresWriter.Session session, PendingAuditEntry[] entries, EngineStateWrite? state, IStateSealer? sealer, long? epoch, CancellationToken cancellationToken, IReadOnlyList<long>? removeInbox = null)
    {
        await using var transaction = await session.Connection.BeginTransactionAsync(cancellationToken);
        var lockCommand = await session.CommandAsync(LockSql, transaction, cancellationToken);
        await lockCommand.ExecuteNonQueryAsync(cancellationToken);
        if (epoch is { } fence)
        {
            var epochCommand = await session.CommandAsync(EpochSql, transaction, cancellationToken);
            var current = await epochCommand.ExecuteScalarAsync(cancellationToken) is long value ? value : (long?)null;
            if (current != fence)
            {
                await transaction.RollbackAsync(cancellationToken);
                throw new StaleEpochException(fence, current);
            }
        }
        if (removeInbox is { Count: > 0 })
        {
            var delete = await session.CommandAsync(DeleteInboxSql, transaction, cancellationToken, NpgsqlDbType.Array | NpgsqlDbType.Bigint);
            PostgresWriter.Session.Bind(delete, removeInbox.ToArray());
            var deleted = await delete.ExecuteNonQueryAsync(cancellationToken);
            if (deleted != removeInbox.Count)
            {
                await transaction.RollbackAsync(cancellationToken);
                throw new InboxClaimLostException(removeInbox.Count, deleted);
            }
        }
        AuditChainHead? head = null;
        var headCommand = await session.CommandAsync(HeadSql, transaction, cancellationToken);
        await using (var reader = await headCommand.ExecuteReaderAsync(cancellationToken))
        {
            if (await reader.ReadAsync(cancellationToken))
            {
                head = new AuditChainHead(reader.GetInt64(0), reader.GetString(1));
            }
        }
        var appended = new List<AuditEntry>(entries.Length);
        if (entries.Length > 0)
        {
            var insert = await session.CommandAsync(InsertAuditSql, transaction, cancellationToken,
                NpgsqlDbType.Bigint, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text);
            foreach (var entry in entries)
            {
                var next = AuditChain.Append(head, entry);
                appended.Add(next);
                PostgresWriter.Session.Bind(insert, next.Sequence, AuditCanonical.FormatTime(next.Time), next.Actor, next.Kind, next.PayloadJson, next.PreviousHash, next.Hash);
                await insert.ExecuteNonQueryAsync(cancellationToken);
                head = new AuditChainHead(next.Sequence, next.Hash);
            }
        }
        if (state is not null)
        {
            // sealed inside the transaction, as on SQLite (docs/audit.md "State seal")
            var signature = sealer?.Seal(head?.Sequence ?? 0, head?.Hash, state.StateJson, state.ProfileVersion);
            var upsert = await session.CommandAsync(StateSql, transaction, cancellationToken,
                NpgsqlDbType.Integer, NpgsqlDbType.Text, NpgsqlDbType.Bigint, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text);
            PostgresWriter.Session.Bind(upsert, EngineStateRow.SingleId, state.StateJson, head?.Sequence ?? 0, head?.Hash, signature, state.ProfileVersion, UtcTextConverter.Format(state.SavedAt));
            await upsert.ExecuteNonQueryAsync(cancellationToken);
        }
        // A failed commit throws (and the session is discarded): nothing is reported as committed that was not.
        await transaction.CommitAsync(cancellationToken);
        return appended;
    }

    /// <summary>
    /// Inserts the rows in one transaction (all or none). With a <paramref name="claim"/> the same transaction first
    /// checks the claim's epoch against <c>engine_leadership</c> with a share lock on its row (a takeover's update of
    /// the epoch waits for this commit, or this check sees the new epoch) and deletes the claimed inbox rows, writing
    /// nothing when any of them is gone: an inbox row's readings are stored exactly once (docs/engine.md R74).
    /// </summary>
    public static async Task<int> InsertReadingsAsync(PostgresWriter.Session session, IReadOnlyList<ReadingRow> rows, InboxClaim? claim, CancellationToken cancellationToken)
    {
        await using var transaction = await session.Connection.BeginTransactionAsync(cancellationToken);
        if (claim is not null)
        {
            if (claim.Epoch is { } fence)
            {
                var epochCommand = await session.CommandAsync(EpochShareSql, transaction, cancellationToken);
                var current = await epochCommand.ExecuteScalarAsync(cancellationToken) is long value ? value : (long?)null;
                if (current != fence)
                {
                    await transaction.RollbackAsync(cancellationToken);
                    throw new StaleEpochException(fence, current);
                }
            }
            var delete = await session.CommandAsync(DeleteInboxSql, transaction, cancellationToken, NpgsqlDbType.Array | NpgsqlDbType.Bigint);
            PostgresWriter.Session.Bind(delete, claim.Ids.ToArray());
            var deleted = await delete.ExecuteNonQueryAsync(cancellationToken);
            if (deleted != claim.Ids.Count)
            {
                await transaction.RollbackAsync(cancellationToken);
                throw new InboxClaimLostException(claim.Ids.Count, deleted);
            }
        }
        var insert = await session.CommandAsync(InsertReadingSql, transaction, cancellationToken,
            NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text, NpgsqlDbType.Text,
            NpgsqlDbType.Double, NpgsqlDbType.Text, NpgsqlDbType.Boolean, NpgsqlDbType.Text, NpgsqlDbType.Text);
        foreach (var row in rows)
        {
            PostgresWriter.Session.Bind(insert,
                row.Time is { } time ? UtcTextConverter.Format(time) : null,
                UtcTextConverter.Format(row.ReceivedAt),
                row.Source, row.Sensor, row.Kind, row.Value, row.Status, row.Accepted, row.RejectReason, row.RejectDetail);
            await insert.ExecuteNonQueryAsync(cancellationToken);
        }
        await transaction.CommitAsync(cancellationToken);
        return rows.Count;
    }
}
