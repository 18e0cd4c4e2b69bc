using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Core.Readings;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Stores;

/// <summary>
/// The <c>readings</c> table: batch insert of everything received, and reads by receipt time. Inserts are on the
/// engine's path to every published state, so they go through one long-lived writer connection
/// (<see cref="SqliteWriter"/>) with a kept INSERT; reads use EF.
/// </summary>
public sealed class ReadingStore(IDbContextFactory<OpsLvpDbContext> factory) : IDisposable
{
    private const string InsertSql =
        "INSERT INTO readings (time, received_at, source, sensor, kind, value, status, accepted, reject_reason, reject_detail) "
        + "VALUES ($t, $r, $s, $n, $k, $v, $st, $a, $rr, $rd);";

    private readonly SqliteWriter _writer = new(factory, "reading store");

    private readonly PostgresWriter _postgresWriter = new(factory, "reading store");

    private readonly ProviderProbe _provider = new(factory);

    /// <summary>Inserts the batch in one transaction (all or none).</summary>
    /// <exception cref="ArgumentException">An accepted reading lacks time, value or status or has a reject reason, or a rejected one has none; or source is empty.</exception>
    public Task InsertAsync(IReadOnlyList<ReceivedReading> readings, CancellationToken cancellationToken = default) =>
        InsertAsync(readings, null, cancellationToken);

    /// <summary>
    /// Inserts the batch in one transaction (all or none) and, with a <paramref name="claim"/> (PostgreSQL only), deletes
    /// the claimed <c>reading_inbox</c> rows in the same transaction (docs/engine.md R74).
    /// </summary>
    /// <exception cref="ArgumentException">An accepted reading lacks time, value or status or has a reject reason, or a rejected one has none; or source is empty.</exception>
    /// <exception cref="StaleEpochException">The claim's epoch is no longer the current one: nothing was written.</exception>
    /// <exception cref="InboxClaimLostException">A claimed row is gone (another node stored it): nothing was written.</exception>
    /// <exception cref="InvalidOperationException">A claim on SQLite, which has no inbox.</exception>
    public async Task InsertAsync(IReadOnlyList<ReceivedReading> readings, InboxClaim? claim, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(readings);
        var rows = readings.Select(ToRow).ToList();
        if (claim is { Ids.Count: 0 })
        {
            claim = null;
        }
        if (rows.Count == 0 && claim is null)
        {
            return;
        }
        if (_provider.IsPostgres)
        {
            await _postgresWriter.RunAsync((session, ct) => PostgresHotPath.InsertReadingsAsync(session, rows, claim, ct), cancellationToken);
            return;
        }
        if (claim is not null)
        {
            throw new InvalidOperationException("the reading inbox is used with PostgreSQL only (several nodes)");
        }
        await _writer.RunAsync(session =>
        {
            using var transaction = session.Connection.BeginTransaction(deferred: false);
            var insert = session.Command(InsertSql, transaction, "$t", "$r", "$s", "$n", "$k", "$v", "$st", "$a", "$rr", "$rd");
            foreach (var row in rows)
            {
                SqliteWriter.Session.Bind(insert,
                    row.Time is { } time ? UtcTextConverter.Format(time) : null,
                    UtcTextConverter.Format(row.ReceivedAt),
                    row.Source, row.Sensor, row.Kind, row.Value, row.Status, row.Accepted, row.RejectReason, row.RejectDetail);
                insert.ExecuteNonQuery();
            }
            transaction.Commit();
            return rows.Count;
        }, cancellationToken);
    }

    public void Dispose()
    {
        _writer.Dispose();
        _postgresWriter.Dispose();
    }

    /// <summary>Readings received with <paramref name="from"/> ≤ received_at &lt; <paramref name="to"/>, in insertion order.</summary>
    public async Task<IReadOnlyList<ReceivedReading>> GetReceivedAsync(DateTimeOffset from, DateTimeOffset to, CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var rows = await db.Readings.AsNoTracking()
            .Where(r => r.ReceivedAt >= from && r.ReceivedAt < to)
            .OrderBy(r => r.Id)
            .ToListAsync(cancellationToken);
        return rows.ConvertAll(r => new ReceivedReading(
            r.ReceivedAt, r.Source, r.Sensor, r.Kind, r.Time, r.Value, r.Status, r.Accepted,
            r.RejectReason is null ? null : Enum.Parse<RejectReason>(r.RejectReason), r.RejectDetail));
    }

    /// <summary>
    /// Count and digest of the stored readings with <paramref name="after"/> &lt; id ≤ <paramref name="to"/> (all above
    /// <paramref name="after"/> when <paramref name="to"/> is null), streamed in id order (docs/audit.md "Readings covered").
    /// </summary>
    public async Task<ReadingsCoverage> CoverAsync(long after, long? to = null, CancellationToken cancellationToken = default)
    {
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var query = db.Readings.AsNoTracking().Where(r => r.Id > after);
        if (to is { } last)
        {
            query = query.Where(r => r.Id <= last);
        }
        using var digest = new ReadingsDigest();
        await foreach (var r in query.OrderBy(r => r.Id).AsAsyncEnumerable().WithCancellation(cancellationToken))
        {
            digest.Add(r.Id, r.ReceivedAt, r.Source, r.Sensor, r.Kind, r.Time, r.Value, r.Status, r.Accepted, r.RejectReason, r.RejectDetail);
        }
        return new ReadingsCoverage(after, to ?? (digest.Count > 0 ? digest.LastId : after), digest.Count, digest.Finish());
    }

    private static ReadingRow ToRow(ReceivedReading reading)
    {
        ArgumentNullException.ThrowIfNull(reading);
        ArgumentException.ThrowIfNullOrWhiteSpace(reading.Source);
        ArgumentNullException.ThrowIfNull(reading.Sensor);
        ArgumentNullException.ThrowIfNull(reading.Kind);
        if (reading.Accepted && (reading.RejectReason is not null || reading.Time is null || reading.Value is null || reading.Status is null))
        {
            throw new ArgumentException($"accepted reading from sensor '{reading.Sensor}' must have time, value and status and no reject reason", nameof(reading));
        }
        if (!reading.Accepted && reading.RejectReason is null)
        {
            throw new ArgumentException($"rejected reading from sensor '{reading.Sensor}' has no reject reason", nameof(reading));
        }
        return new ReadingRow
        {
            Time = reading.Time,
            ReceivedAt = reading.ReceivedAt,
            Source = reading.Source,
            Sensor = reading.Sensor,
            Kind = reading.Kind,
            Value = reading.Value,
            Status = reading.Status,
            Accepted = reading.Accepted,
            RejectReason = reading.RejectReason?.ToString(),
            RejectDetail = reading.RejectDetail,
        };
    }
}
