using System.Data.Common;
using System.Globalization;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Configuration;
using OpsLvp.Data;

namespace OpsLvp.Web.Tests.Persistence;

public class PragmaTests
{
    // SQLite documentation, "PRAGMA synchronous": FULL is 2, NORMAL is 1, OFF is 0.
    private const long SynchronousFull = 2;

    [Fact]
    public async Task EveryNewContextConnection_IsWalFullWithBusyTimeoutAndForeignKeys()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();

        for (var i = 0; i < 3; i++)
        {
            await using var db = temp.Factory.CreateDbContext();
            await db.Database.OpenConnectionAsync();
            var connection = db.Database.GetDbConnection();

            Assert.Equal("wal", await ScalarTextAsync(connection, "PRAGMA journal_mode;"));
            Assert.Equal(SynchronousFull, await ScalarNumberAsync(connection, "PRAGMA synchronous;"));
            Assert.Equal(SqlitePragmaInterceptor.DefaultBusyTimeoutMs, await ScalarNumberAsync(connection, "PRAGMA busy_timeout;"));
            Assert.Equal(1, await ScalarNumberAsync(connection, "PRAGMA foreign_keys;"));
        }
    }

    [Fact]
    public async Task FileCreatedInRollbackMode_IsWalAfterTheFirstContextOpens_AndStaysWal()
    {
        using var temp = TempDatabase.CreateEmpty();
        await temp.ExecuteRawAsync("CREATE TABLE t (x INTEGER);");
        await using (var raw = new SqliteConnection($"Data Source={temp.FilePath};Pooling=False"))
        {
            await raw.OpenAsync();
            Assert.Equal("delete", await ScalarTextAsync(raw, "PRAGMA journal_mode;"));
        }

        await using (var db = temp.Factory.CreateDbContext())
        {
            await db.Database.OpenConnectionAsync();
        }

        await using var after = new SqliteConnection($"Data Source={temp.FilePath};Pooling=False");
        await after.OpenAsync();
        Assert.Equal("wal", await ScalarTextAsync(after, "PRAGMA journal_mode;"));
    }

    [Fact]
    public async Task PooledConnectionLeftWithSynchronousOff_IsFullAgainWhenAContextOpensIt()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        await using (var raw = new SqliteConnection(temp.ConnectionString))
        {
            await raw.OpenAsync();
            await ExecuteAsync(raw, "PRAGMA synchronous=OFF;");
            Assert.Equal(0, await ScalarNumberAsync(raw, "PRAGMA synchronous;"));
        }

        await using var db = temp.Factory.CreateDbContext();
        await db.Database.OpenConnectionAsync();

        Assert.Equal(SynchronousFull, await ScalarNumberAsync(db.Database.GetDbConnection(), "PRAGMA synchronous;"));
        await DatabaseChecks.EnsureDurableAsync(db);
    }

    [Fact]
    public async Task DatabaseChecks_SynchronousNormal_FailsNamingSynchronous()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        await using var raw = new SqliteConnection($"Data Source={temp.FilePath};Pooling=False");
        await raw.OpenAsync();
        await ExecuteAsync(raw, "PRAGMA synchronous=NORMAL;");

        var error = await Assert.ThrowsAsync<InvalidOperationException>(() => DatabaseChecks.EnsureDurableAsync(raw));

        Assert.Contains("PRAGMA synchronous", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task DatabaseChecks_RollbackJournal_FailsNamingJournalMode()
    {
        using var temp = TempDatabase.CreateEmpty();
        await using var raw = new SqliteConnection($"Data Source={temp.FilePath};Pooling=False");
        await raw.OpenAsync();
        await ExecuteAsync(raw, "CREATE TABLE t (x INTEGER);");

        var error = await Assert.ThrowsAsync<InvalidOperationException>(() => DatabaseChecks.EnsureDurableAsync(raw));

        Assert.Contains("PRAGMA journal_mode", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task DatabaseChecks_InMemoryDatabase_Fails()
    {
        var options = OpsLvpDatabase.SqliteOptions("Data Source=:memory:");
        await using var db = new OpsLvpDbContext(options);

        var error = await Assert.ThrowsAsync<InvalidOperationException>(() => DatabaseChecks.EnsureDurableAsync(db));

        Assert.Contains("journal_mode is 'memory'", error.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("Oracle", "Data Source=x.db", OpsLvpDatabase.ProviderSetting)]
    [InlineData("Postgres", "", OpsLvpDatabase.PostgresConnectionStringSetting)]
    [InlineData("Postgres", "Database=opslvp", OpsLvpDatabase.PostgresConnectionStringSetting)]
    [InlineData("Postgres", "Nonsense Key=1", OpsLvpDatabase.PostgresConnectionStringSetting)]
    [InlineData("Sqlite", "", OpsLvpDatabase.ConnectionStringSetting)]
    [InlineData(null, null, OpsLvpDatabase.ConnectionStringSetting)]
    [InlineData("Sqlite", "Nonsense Key=1", OpsLvpDatabase.ConnectionStringSetting)]
    public void Configure_BadSettings_FailNamingTheSetting(string? provider, string? connectionString, string setting)
    {
        var configuration = new ConfigurationBuilder()
            .AddInMemoryCollection(new Dictionary<string, string?>
            {
                [OpsLvpDatabase.ProviderSetting] = provider,
                [OpsLvpDatabase.ConnectionStringSetting] = connectionString,
            })
            .Build();

        var error = Assert.Throws<InvalidOperationException>(() => OpsLvpDatabase.Configure(new DbContextOptionsBuilder<OpsLvpDbContext>(), configuration));

        Assert.Contains(setting, error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Configure_ProviderNotSet_DefaultsToSqlite()
    {
        var configuration = new ConfigurationBuilder()
            .AddInMemoryCollection(new Dictionary<string, string?> { [OpsLvpDatabase.ConnectionStringSetting] = "Data Source=unused.db" })
            .Build();
        var builder = new DbContextOptionsBuilder<OpsLvpDbContext>();

        OpsLvpDatabase.Configure(builder, configuration);

        using var db = new OpsLvpDbContext(builder.Options);
        Assert.True(db.Database.IsSqlite());
    }

    private static async Task ExecuteAsync(DbConnection connection, string sql)
    {
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        await command.ExecuteNonQueryAsync();
    }

    private static async Task<string?> ScalarTextAsync(DbConnection connection, string sql)
    {
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        return Convert.ToString(await command.ExecuteScalarAsync(), CultureInfo.InvariantCulture);
    }

    private static async Task<long> ScalarNumberAsync(DbConnection connection, string sql)
    {
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        return Convert.ToInt64(await command.ExecuteScalarAsync(), CultureInfo.InvariantCulture);
    }
}
