using Npgsql;
using OpsLvp.Data;

namespace OpsLvp.FaultCases;

/// <summary>What a PostgreSQL database says after a fault, read with the product's own stores on unpooled connections.</summary>
public sealed class PostgresStoredFacts(string connectionString) : DatabaseFacts(Factory(connectionString))
{
    private readonly string _connectionString = Unpooled(connectionString);

    private static string Unpooled(string connectionString) =>
        new NpgsqlConnectionStringBuilder(connectionString) { Pooling = false }.ConnectionString;

    private static OpsLvpDbContextFactory Factory(string connectionString) =>
        new(OpsLvpDatabase.PostgresOptions(Unpooled(connectionString)));

    protected override async Task<string?> CheckDatabaseAsync()
    {
        await using var connection = new NpgsqlConnection(_connectionString);
        await connection.OpenAsync();
        await using var gaps = new NpgsqlCommand("SELECT COUNT(*) = MAX(sequence) AND MIN(sequence) = 1 FROM audit_entries", connection);
        return await gaps.ExecuteScalarAsync() is not true ? "audit sequences are not 1..n without a gap" : null;
    }

    /// <summary>Reading batches still waiting in the reading inbox (pushed to a standby, not yet stored by the leader).</summary>
    public async Task<long> InboxWaitingAsync()
    {
        await using var connection = new NpgsqlConnection(_connectionString);
        await connection.OpenAsync();
        await using var count = new NpgsqlCommand("SELECT COUNT(*) FROM reading_inbox", connection);
        return (long)(await count.ExecuteScalarAsync())!;
    }
}
