using Npgsql;
using OpsLvp.Data;
using OpsLvp.Data.Entities;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Persistence;

/// <summary>
/// <see cref="ReadingInboxStore.RecordFailedAttemptAsync"/> on a throwaway PostgreSQL database (docs/engine.md R82): the
/// count and the last error live on the row, the statement is fenced by the leadership epoch on record. The batch body
/// and names are invented.
/// </summary>
public sealed class ReadingInboxAttemptsTests
{
    [PostgresFact]
    public async Task FailedAttempts_AreCountedOnTheRow_WithTheLastError_OnlyUnderTheCurrentEpoch()
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(OpsLvpDatabase.PostgresProvider);
        var inbox = new ReadingInboxStore(db.NewFactory());
        var id = await inbox.EnqueueAsync(new ReadingInboxRow { ReceivedAt = DateTimeOffset.UtcNow, Source = "push:invented", NodeId = "node-t", Body = "{\"readings\":[]}" });
        await ExecuteAsync(db, "INSERT INTO engine_leadership (id, epoch, node_id, since) VALUES (1, 7, 'node-t', '2026-01-01T00:00:00.000Z')");

        // a new row starts at 0 with no error
        Assert.Equal((0, (string?)null), await RowAsync(db, id));

        // under the epoch on record: counted, the error kept, the count read back
        Assert.Equal(1, await inbox.RecordFailedAttemptAsync(id, "first invented error", 7));
        Assert.Equal(2, await inbox.RecordFailedAttemptAsync(id, "second invented error", 7));
        Assert.Equal((2, "second invented error"), await RowAsync(db, id));

        // a stale epoch (another node has taken over since): refused, nothing counted
        var stale = await Assert.ThrowsAsync<StaleEpochException>(() => inbox.RecordFailedAttemptAsync(id, "stale invented error", 6));
        Assert.Equal(7, stale.Current);
        Assert.Equal((2, "second invented error"), await RowAsync(db, id));

        // a row already gone (taken or set aside by another node): nothing to count
        await ExecuteAsync(db, $"DELETE FROM reading_inbox WHERE id = {id}");
        Assert.Null(await inbox.RecordFailedAttemptAsync(id, "late invented error", 7));
    }

    private static async Task ExecuteAsync(ProviderDatabase db, string sql)
    {
        await using var connection = new NpgsqlConnection(db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync();
    }

    private static async Task<(int Attempts, string? LastError)> RowAsync(ProviderDatabase db, long id)
    {
        await using var connection = new NpgsqlConnection(db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand($"SELECT attempts, last_error FROM reading_inbox WHERE id = {id}", connection);
        await using var reader = await command.ExecuteReaderAsync();
        Assert.True(await reader.ReadAsync());
        return (reader.GetInt32(0), reader.IsDBNull(1) ? null : reader.GetString(1));
    }
}
