using System.Data.Common;
using System.Globalization;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using Microsoft.EntityFrameworkCore.Metadata;
using Npgsql;
using NpgsqlTypes;
using OpsLvp.Data.Stores;

namespace OpsLvp.Data.Copy;

/// <summary>
/// Copies an installation from a SQLite file to an empty PostgreSQL database (<c>opslvp migrate</c>, docs/cli.md):
/// every table of the model (readings, audit log, engine state, feed health, accounts and their roles, display links,
/// API keys, data-protection keys), rows exactly as stored, in one transaction on the target, with PostgreSQL's binary
/// COPY. The source is opened read-only and its chain verified first; the target is migrated, must hold no rows, and
/// its chain is verified after the copy.
/// </summary>
public static class SqliteToPostgresCopy
{
    /// <exception cref="InvalidDataException">The source is not an OpsLvp database, its chain does not verify, or the target already holds rows.</exception>
    /// <exception cref="DbException">Either database failed; nothing was committed on the target.</exception>
    public static async Task<DatabaseCopyResult> CopyAsync(string sqliteFile, string postgresConnectionString, CancellationToken cancellationToken = default)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(sqliteFile);
        ArgumentException.ThrowIfNullOrWhiteSpace(postgresConnectionString);
        if (!File.Exists(sqliteFile))
        {
            throw new InvalidDataException($"database file '{sqliteFile}' not found");
        }
        var sourceConnectionString = new SqliteConnectionStringBuilder { DataSource = sqliteFile, Mode = SqliteOpenMode.ReadOnly, Pooling = false }.ToString();
        var sourceOptions = OpsLvpDatabase.SqliteOptions(sourceConnectionString);
        var targetOptions = OpsLvpDatabase.PostgresOptions(postgresConnectionString);

        string? sourceHead;
        await using (var source = new OpsLvpDbContext(sourceOptions))
        {
            var pending = (await source.Database.GetPendingMigrationsAsync(cancellationToken)).ToList();
            if (pending.Count > 0)
            {
                throw new InvalidDataException($"the source is not an up-to-date OpsLvp database ({pending.Count} migrations not applied; start the app on it once, or it is not an OpsLvp file)");
            }
        }
        using (var sourceStore = new AuditStore(new OpsLvpDbContextFactory(sourceOptions)))
        {
            var sourceCheck = await sourceStore.VerifyAsync(cancellationToken);
            if (!sourceCheck.Ok)
            {
                throw new InvalidDataException($"the source's audit chain does not verify (sequence {sourceCheck.FirstBadSequence}: {sourceCheck.Detail}); nothing copied");
            }
            sourceHead = (await sourceStore.GetHeadAsync(cancellationToken))?.Hash;
        }

        var targetFactory = new OpsLvpDbContextFactory(targetOptions);
        await DatabaseStartup.MigrateAndCheckAsync(targetFactory, cancellationToken);

        var rows = new List<KeyValuePair<string, long>>();
        await using (var target = new OpsLvpDbContext(targetOptions))
        await using (var source = new OpsLvpDbContext(sourceOptions))
        {
            var tables = TablesInDependencyOrder(target.Model);
            await target.Database.OpenConnectionAsync(cancellationToken);
            await source.Database.OpenConnectionAsync(cancellationToken);
            var pg = (NpgsqlConnection)target.Database.GetDbConnection();
            var sqlite = (SqliteConnection)source.Database.GetDbConnection();
            await using var transaction = await pg.BeginTransactionAsync(cancellationToken);
            foreach (var table in tables)
            {
                await EnsureEmptyAsync(pg, table, cancellationToken);
            }
            foreach (var table in tables)
            {
                rows.Add(new(table.Name, await CopyTableAsync(sqlite, pg, table, cancellationToken)));
            }
            foreach (var table in tables)
            {
                await ResetIdentityAsync(pg, table, cancellationToken);
            }
            await transaction.CommitAsync(cancellationToken);
        }

        using var targetStore = new AuditStore(targetFactory);
        var verification = await targetStore.VerifyAsync(cancellationToken);
        var targetHead = (await targetStore.GetHeadAsync(cancellationToken))?.Hash;
        return new DatabaseCopyResult(rows, verification, sourceHead, targetHead);
    }

    private sealed record Column(string Name, NpgsqlDbType Type, Type ProviderType, bool Identity);

    private sealed record Table(string Name, IReadOnlyList<Column> Columns);

    /// <summary>Each mapped table once, principals before dependents (so foreign keys hold row by row).</summary>
    private static List<Table> TablesInDependencyOrder(IModel model)
    {
        var ordered = new List<IEntityType>();
        var remaining = model.GetEntityTypes().Where(e => e.GetTableName() is not null).OrderBy(e => e.GetTableName(), StringComparer.Ordinal).ToList();
        while (remaining.Count > 0)
        {
            var next = remaining.FirstOrDefault(e => e.GetForeignKeys().All(fk => fk.PrincipalEntityType == e || ordered.Contains(fk.PrincipalEntityType)))
                ?? throw new InvalidOperationException("the model's foreign keys form a cycle");
            ordered.Add(next);
            remaining.Remove(next);
        }
        return ordered.ConvertAll(entity =>
        {
            var name = entity.GetTableName()!;
            var store = StoreObjectIdentifier.Table(name, entity.GetSchema());
            var columns = entity.GetProperties()
                .Select(p =>
                {
                    var stored = p.GetTypeMapping().Converter?.ProviderClrType ?? p.ClrType;
                    stored = Nullable.GetUnderlyingType(stored) ?? stored;
                    return new Column(p.GetColumnName(store)!, WireType(stored, name), stored,
                        p.ValueGenerated == ValueGenerated.OnAdd && p.IsPrimaryKey() && stored != typeof(string));
                })
                .ToList();
            return new Table(name, columns);
        });
    }

    private static async Task EnsureEmptyAsync(NpgsqlConnection pg, Table table, CancellationToken cancellationToken)
    {
        await using var command = new NpgsqlCommand($"SELECT EXISTS (SELECT 1 FROM {Quote(table.Name)})", pg);
        if ((bool)(await command.ExecuteScalarAsync(cancellationToken))!)
        {
            throw new InvalidDataException($"the target already holds rows in '{table.Name}'; migrate copies into an empty database only");
        }
    }

    private static async Task<long> CopyTableAsync(SqliteConnection sqlite, NpgsqlConnection pg, Table table, CancellationToken cancellationToken)
    {
        var columnList = string.Join(", ", table.Columns.Select(c => Quote(c.Name)));
        await using var read = sqlite.CreateCommand();
        read.CommandText = $"SELECT {columnList} FROM {Quote(table.Name)}";
        await using var reader = await read.ExecuteReaderAsync(cancellationToken);
        await using var importer = await pg.BeginBinaryImportAsync($"COPY {Quote(table.Name)} ({columnList}) FROM STDIN (FORMAT BINARY)", cancellationToken);
        long count = 0;
        while (await reader.ReadAsync(cancellationToken))
        {
            await importer.StartRowAsync(cancellationToken);
            for (var i = 0; i < table.Columns.Count; i++)
            {
                if (await reader.IsDBNullAsync(i, cancellationToken))
                {
                    await importer.WriteNullAsync(cancellationToken);
                    continue;
                }
                var column = table.Columns[i];
                var value = Convert.ChangeType(reader.GetValue(i), column.ProviderType, CultureInfo.InvariantCulture);
                await importer.WriteAsync(value, column.Type, cancellationToken);
            }
            count++;
        }
        await importer.CompleteAsync(cancellationToken);
        return count;
    }

    /// <summary>Identity columns continue after the copied ids (COPY wrote them explicitly).</summary>
    private static async Task ResetIdentityAsync(NpgsqlConnection pg, Table table, CancellationToken cancellationToken)
    {
        foreach (var column in table.Columns.Where(c => c.Identity))
        {
            await using var command = new NpgsqlCommand(
                $"SELECT setval(pg_get_serial_sequence(@t, @c), COALESCE((SELECT MAX({Quote(column.Name)}) FROM {Quote(table.Name)}), 0) + 1, false)", pg);
            command.Parameters.AddWithValue("t", table.Name);
            command.Parameters.AddWithValue("c", column.Name);
            await command.ExecuteScalarAsync(cancellationToken);
        }
    }

    /// <summary>The binary COPY type for a stored CLR type (text also fills varchar columns: same wire format).</summary>
    private static NpgsqlDbType WireType(Type stored, string table) =>
        stored == typeof(string) ? NpgsqlDbType.Text
        : stored == typeof(long) ? NpgsqlDbType.Bigint
        : stored == typeof(int) ? NpgsqlDbType.Integer
        : stored == typeof(short) ? NpgsqlDbType.Smallint
        : stored == typeof(bool) ? NpgsqlDbType.Boolean
        : stored == typeof(double) ? NpgsqlDbType.Double
        : stored == typeof(byte[]) ? NpgsqlDbType.Bytea
        : throw new InvalidOperationException($"table '{table}' has a column of type {stored.Name}, which the copy does not know");

    private static string Quote(string identifier) => "\"" + identifier.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"";
}
