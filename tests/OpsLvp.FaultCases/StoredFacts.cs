using Microsoft.Data.Sqlite;
using OpsLvp.Data;

namespace OpsLvp.FaultCases;

/// <summary>
/// What the database file says after a fault, read with the product's own stores on connections that are not pooled
/// (so no descriptor stays open on a filesystem that is unmounted next); adds <c>integrity_check</c> to the checks.
/// </summary>
public sealed class StoredFacts(string databasePath) : DatabaseFacts(Factory(databasePath))
{
    private readonly string _connectionString = ConnectionString(databasePath);

    private static string ConnectionString(string databasePath) => $"Data Source={databasePath};Pooling=False";

    private static OpsLvpDbContextFactory Factory(string databasePath) =>
        new(OpsLvpDatabase.SqliteOptions(ConnectionString(databasePath)));

    protected override async Task<string?> CheckDatabaseAsync()
    {
        await using var connection = new SqliteConnection(_connectionString);
        await connection.OpenAsync();
        await using var integrity = connection.CreateCommand();
        integrity.CommandText = "PRAGMA integrity_check;";
        var result = (string?)await integrity.ExecuteScalarAsync();
        if (result != "ok")
        {
            return $"integrity_check: {result}";
        }
        await using var gaps = connection.CreateCommand();
        gaps.CommandText = "SELECT COUNT(*) = MAX(sequence) AND MIN(sequence) = 1 FROM audit_entries;";
        return (long)(await gaps.ExecuteScalarAsync())! != 1L ? "audit sequences are not 1..n without a gap" : null;
    }
}
