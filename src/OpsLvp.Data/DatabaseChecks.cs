using System.Data;
using System.Data.Common;
using System.Globalization;
using Microsoft.EntityFrameworkCore;
using Npgsql;

namespace OpsLvp.Data;

/// <summary>Checks, at start, that the durability settings are really in force (the host calls it after migrating).</summary>
public static class DatabaseChecks
{
    /// <summary>Reads <c>PRAGMA journal_mode</c> and <c>PRAGMA synchronous</c> back on a connection of this context.</summary>
    /// <exception cref="InvalidOperationException">journal_mode is not WAL or synchronous is not FULL; the message names the pragma.</exception>
    public static async Task EnsureDurableAsync(OpsLvpDbContext db, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(db);
        var connection = db.Database.GetDbConnection();
        var opened = connection.State != ConnectionState.Open;
        if (opened)
        {
            await db.Database.OpenConnectionAsync(cancellationToken);
        }
        try
        {
            await EnsureDurableAsync(connection, cancellationToken);
        }
        finally
        {
            if (opened)
            {
                await db.Database.CloseConnectionAsync();
            }
        }
    }

    /// <summary>
    /// The same check on an open connection. SQLite: journal_mode WAL and synchronous FULL. PostgreSQL: <c>fsync</c> on
    /// and <c>synchronous_commit</c> not <c>off</c> (a commit that returned survives a crash of the server).
    /// </summary>
    /// <exception cref="InvalidOperationException">A setting is not in force; the message names it.</exception>
    public static async Task EnsureDurableAsync(DbConnection connection, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(connection);
        if (connection is NpgsqlConnection)
        {
            var fsync = Convert.ToString(await ScalarAsync(connection, "SHOW fsync;", cancellationToken), CultureInfo.InvariantCulture);
            if (!string.Equals(fsync, "on", StringComparison.OrdinalIgnoreCase))
            {
                throw new InvalidOperationException($"PostgreSQL fsync is '{fsync}', expected 'on'.");
            }
            var synchronousCommit = Convert.ToString(await ScalarAsync(connection, "SHOW synchronous_commit;", cancellationToken), CultureInfo.InvariantCulture);
            if (string.Equals(synchronousCommit, "off", StringComparison.OrdinalIgnoreCase))
            {
                throw new InvalidOperationException("PostgreSQL synchronous_commit is 'off', expected 'on' (or local, remote_write, remote_apply).");
            }
            return;
        }
        var journalMode = Convert.ToString(await ScalarAsync(connection, "PRAGMA journal_mode;", cancellationToken), CultureInfo.InvariantCulture);
        if (!string.Equals(journalMode, "wal", StringComparison.OrdinalIgnoreCase))
        {
            throw new InvalidOperationException($"SQLite PRAGMA journal_mode is '{journalMode}', expected 'wal' (is the database in memory or read-only?).");
        }
        var synchronous = Convert.ToInt64(await ScalarAsync(connection, "PRAGMA synchronous;", cancellationToken), CultureInfo.InvariantCulture);
        if (synchronous != 2)
        {
            throw new InvalidOperationException($"SQLite PRAGMA synchronous is {synchronous}, expected 2 (FULL).");
        }
    }

    private static async Task<object?> ScalarAsync(DbConnection connection, string sql, CancellationToken cancellationToken)
    {
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        return await command.ExecuteScalarAsync(cancellationToken);
    }
}
