using System.Data.Common;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore.Diagnostics;

namespace OpsLvp.Data;

/// <summary>
/// Runs the connection pragmas on every opened connection (pooled ones included, since <c>synchronous</c>,
/// <c>busy_timeout</c> and <c>foreign_keys</c> are per connection): <c>journal_mode=WAL</c> (persistent in the
/// file), <c>synchronous=FULL</c> (a committed audit entry survives power loss), <c>busy_timeout</c>,
/// <c>foreign_keys=ON</c>. A read-only connection gets only <c>busy_timeout</c>, <c>foreign_keys</c> and
/// <c>query_only</c>, so verifying a copied file never changes it. So does any connection opened with
/// <c>Mode=ReadOnly</c> whatever this interceptor was made for: EF opens one to ask whether the file exists, and on a
/// database left in rollback-journal mode <c>journal_mode=WAL</c> would be a write ("attempt to write a readonly
/// database", docs/reliability.md "Storage faults").
/// </summary>
public sealed class SqlitePragmaInterceptor(bool readOnly = false, int busyTimeoutMs = SqlitePragmaInterceptor.DefaultBusyTimeoutMs) : DbConnectionInterceptor
{
    public const int DefaultBusyTimeoutMs = 5000;

    private readonly string _readOnlySql = $"PRAGMA busy_timeout={busyTimeoutMs}; PRAGMA foreign_keys=ON; PRAGMA query_only=ON;";

    private readonly string _readWriteSql = readOnly
        ? $"PRAGMA busy_timeout={busyTimeoutMs}; PRAGMA foreign_keys=ON; PRAGMA query_only=ON;"
        : $"PRAGMA journal_mode=WAL; PRAGMA synchronous=FULL; PRAGMA busy_timeout={busyTimeoutMs}; PRAGMA foreign_keys=ON;";

    public override void ConnectionOpened(DbConnection connection, ConnectionEndEventData eventData)
    {
        using var command = connection.CreateCommand();
        command.CommandText = SqlFor(connection);
        command.ExecuteNonQuery();
    }

    public override async Task ConnectionOpenedAsync(DbConnection connection, ConnectionEndEventData eventData, CancellationToken cancellationToken = default)
    {
        await using var command = connection.CreateCommand();
        command.CommandText = SqlFor(connection);
        await command.ExecuteNonQueryAsync(cancellationToken);
    }

    private string SqlFor(DbConnection connection) =>
        connection is SqliteConnection sqlite && new SqliteConnectionStringBuilder(sqlite.ConnectionString).Mode == SqliteOpenMode.ReadOnly
            ? _readOnlySql
            : _readWriteSql;
}
