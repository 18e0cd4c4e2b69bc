using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using Npgsql;
using OpsLvp.Data;

namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>
/// An empty database of either provider for one test: a SQLite file in a temporary folder, or a fresh database on the
/// test's PostgreSQL cluster (<see cref="PostgresCluster.Shared"/>). <see cref="AppSettings"/> points an
/// <see cref="OpsLvpApp"/> at it, so the same test runs the real app on both.
/// </summary>
public sealed class ProviderDatabase : IDisposable
{
    private readonly string? _folder;

    private ProviderDatabase(string provider, string connectionString, string? folder)
    {
        Provider = provider;
        ConnectionString = connectionString;
        _folder = folder;
        Options = IsPostgres ? OpsLvpDatabase.PostgresOptions(connectionString) : OpsLvpDatabase.SqliteOptions(connectionString);
        Factory = new OpsLvpDbContextFactory(Options);
    }

    /// <summary><see cref="OpsLvpDatabase.SqliteProvider"/> or <see cref="OpsLvpDatabase.PostgresProvider"/>.</summary>
    public string Provider { get; }

    public bool IsPostgres => OpsLvpDatabase.IsPostgres(Provider);

    public string ConnectionString { get; }

    public DbContextOptions<OpsLvpDbContext> Options { get; }

    public OpsLvpDbContextFactory Factory { get; }

    /// <summary>The settings that make the app use this database.</summary>
    public Dictionary<string, string?> AppSettings => IsPostgres
        ? new() { [OpsLvpDatabase.ProviderSetting] = OpsLvpDatabase.PostgresProvider, [OpsLvpDatabase.PostgresConnectionStringSetting] = ConnectionString }
        : new() { [OpsLvpDatabase.ProviderSetting] = OpsLvpDatabase.SqliteProvider, [OpsLvpDatabase.ConnectionStringSetting] = ConnectionString };

    /// <summary>An empty database, not migrated.</summary>
    public static ProviderDatabase Create(string provider)
    {
        if (OpsLvpDatabase.IsPostgres(provider))
        {
            return new ProviderDatabase(provider, PostgresCluster.Shared.CreateDatabase(), null);
        }
        var folder = Directory.CreateTempSubdirectory("opslvp-db-").FullName;
        var file = Path.Combine(folder, "opslvp.db");
        return new ProviderDatabase(OpsLvpDatabase.SqliteProvider, new SqliteConnectionStringBuilder { DataSource = file }.ToString(), folder);
    }

    public static async Task<ProviderDatabase> CreateMigratedAsync(string provider)
    {
        var db = Create(provider);
        await DatabaseStartup.MigrateAndCheckAsync(db.Factory);
        return db;
    }

    /// <summary>A second factory on the same database (as a second store, process or node would have).</summary>
    public OpsLvpDbContextFactory NewFactory() => new(Options);

    /// <summary>Runs SQL on a plain connection of its own, as someone with database access would.</summary>
    public async Task<int> ExecuteRawAsync(string sql)
    {
        if (IsPostgres)
        {
            await using var pg = new NpgsqlConnection(ConnectionString + ";Pooling=false");
            await pg.OpenAsync();
            await using var pgCommand = new NpgsqlCommand(sql, pg);
            return await pgCommand.ExecuteNonQueryAsync();
        }
        await using var connection = new SqliteConnection(new SqliteConnectionStringBuilder(ConnectionString) { Pooling = false }.ToString());
        await connection.OpenAsync();
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        return await command.ExecuteNonQueryAsync();
    }

    public void Dispose()
    {
        if (IsPostgres)
        {
            NpgsqlConnection.ClearAllPools();
            return; // the cluster, with every test database, is deleted when the test process ends
        }
        SqliteConnection.ClearAllPools();
        if (_folder is not null)
        {
            OpsLvpApp.TryDelete(_folder);
        }
    }
}
