using System.Globalization;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;

namespace OpsLvp.Data;

/// <summary>What the host runs before serving: apply migrations, then check the durability pragmas.</summary>
public static class DatabaseStartup
{
    // Several start-up services migrate through the same factory; whichever runs first sees the old mode, and every
    // later call is told it too, so the engine host can put the switch on record whatever the start order.
    private static readonly System.Runtime.CompilerServices.ConditionalWeakTable<object, System.Runtime.CompilerServices.StrongBox<string?>> s_switchedFrom = new();

    /// <summary>
    /// Returns the journal mode an existing database file was found in when it was not WAL (it is WAL now: the first
    /// read-write connection switches it), or null for a WAL or new database; later calls with the same factory
    /// return the same.
    /// </summary>
    /// <exception cref="InvalidOperationException">A pragma is not in force (see <see cref="DatabaseChecks"/>).</exception>
    public static async Task<string?> MigrateAndCheckAsync(IDbContextFactory<OpsLvpDbContext> factory, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(factory);
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var before = db.Database.IsSqlite() ? await JournalModeOfExistingFileAsync(db.Database.GetConnectionString(), cancellationToken) : null;
        await db.Database.MigrateAsync(cancellationToken);
        await DatabaseChecks.EnsureDurableAsync(db, cancellationToken);
        var found = s_switchedFrom.GetValue(factory, _ => new System.Runtime.CompilerServices.StrongBox<string?>());
        if (before is not null && !string.Equals(before, "wal", StringComparison.OrdinalIgnoreCase))
        {
            found.Value = before;
        }
        return found.Value;
    }

    /// <summary>The journal mode of the file, read on a read-only connection of its own; null when there is no file yet.</summary>
    private static async Task<string?> JournalModeOfExistingFileAsync(string? connectionString, CancellationToken cancellationToken)
    {
        if (connectionString is null)
        {
            return null;
        }
        var builder = new SqliteConnectionStringBuilder(connectionString);
        if (string.IsNullOrEmpty(builder.DataSource) || builder.DataSource == ":memory:" || !File.Exists(builder.DataSource))
        {
            return null;
        }
        builder.Mode = SqliteOpenMode.ReadOnly;
        builder.Pooling = false;
        await using var connection = new SqliteConnection(builder.ConnectionString);
        await connection.OpenAsync(cancellationToken);
        await using var command = connection.CreateCommand();
        command.CommandText = "PRAGMA journal_mode;";
        return Convert.ToString(await command.ExecuteScalarAsync(cancellationToken), CultureInfo.InvariantCulture);
    }
}
