using System.Data.Common;
using Microsoft.EntityFrameworkCore.Diagnostics;

namespace OpsLvp.Data;

/// <summary>
/// Runs the connection pragmas on every opened connection (pooled ones included, since <c>synchronous</c>,
/// <c>busy_timeout</c> and <c>foreign_keys</c> are per connection): <c>journal_mode=WAL</c> (persistent in the
/// file), <c>synchronous=FULL</c> (a committed audit entry survives power loss), <c>busy_timeout</c>,
/// <c>foreign_keys=ON</c>. A read-only connection gets only <c>busy_timeout</c>, <c>foreign_keys</c> and
/// <c>query_only</c>, so verifying a copied file never changes it.
/// </summary>
public sealed class SqlitePragmaInterceptor(bool readOnly = false, int busyTimeoutMs = SqlitePragmaInterceptor.DefaultBusyTimeoutMs) : DbConnectionInterceptor
{
    public const int DefaultBusyTimeoutMs = 5000;

    private readonly string _sql = readOnly
        ? $"PRAGMA busy_timeout={busyTimeoutMs}; PRAGMA foreign_keys=ON; PRAGMA query_only=ON;"
        : $"PRAGMA journal_mode=WAL; PRAGMA synchronous=FULL; PRAGMA busy_timeout={busyTimeoutMs}; PRAGMA foreign_keys=ON;";

    public override void ConnectionOpened(DbConnection connection, ConnectionEndEventData eventData)
    {
        using var command = connection.CreateCommand();
        command.CommandText = _sql;
        command.ExecuteNonQuery();
    }

    public override async Task ConnectionOpenedAsync(DbConnection connection, ConnectionEndEventData eventData, CancellationToken cancellationToken = default)
    {
        await using var command = connection.CreateCommand();
        command.CommandText = _sql;
        await command.ExecuteNonQueryAsync(cancellationToken);
    }
}
