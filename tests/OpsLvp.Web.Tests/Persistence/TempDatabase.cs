using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data;

namespace OpsLvp.Web.Tests.Persistence;

/// <summary>A real SQLite file in its own temporary folder, deleted afterwards.</summary>
internal sealed class TempDatabase : IDisposable
{
    private TempDatabase()
    {
        Folder = Directory.CreateTempSubdirectory("opslvp-db-").FullName;
        FilePath = System.IO.Path.Combine(Folder, "opslvp.db");
        ConnectionString = new SqliteConnectionStringBuilder { DataSource = FilePath }.ToString();
        Options = OpsLvpDatabase.SqliteOptions(ConnectionString);
        Factory = new OpsLvpDbContextFactory(Options);
    }

    public string Folder { get; }

    public string FilePath { get; }

    public string ConnectionString { get; }

    public DbContextOptions<OpsLvpDbContext> Options { get; }

    public OpsLvpDbContextFactory Factory { get; }

    /// <summary>An empty file name only: nothing on disk until something opens it.</summary>
    public static TempDatabase CreateEmpty() => new();

    public static async Task<TempDatabase> CreateMigratedAsync()
    {
        var db = new TempDatabase();
        await DatabaseStartup.MigrateAndCheckAsync(db.Factory);
        return db;
    }

    /// <summary>Runs SQL on a plain connection (no interceptor), as someone with the file would.</summary>
    public async Task<int> ExecuteRawAsync(string sql)
    {
        await using var connection = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = FilePath, Pooling = false }.ToString());
        await connection.OpenAsync();
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        return await command.ExecuteNonQueryAsync();
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        try
        {
            Directory.Delete(Folder, recursive: true);
        }
        catch (IOException)
        {
            // A file still held open elsewhere; the temp folder is cleaned by the OS later.
        }
    }
}
