using Microsoft.Data.Sqlite;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>A database left in rollback-journal mode (e.g. by a tool) is switched back to WAL at start (docs/reliability.md "Storage faults").</summary>
public sealed class JournalModeTests
{
    [Fact]
    public async Task DatabaseLeftInRollbackJournalMode_IsSwitchedToWalAtStart_AndTheServerRecords()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var profile = LiveTestProfile.Write(folder);
            await using (var first = OpsLvpApp.Start(LiveTestProfile.Settings(profile), folder))
            {
                await LiveClient.PushAsync(first, LiveClient.Item(DateTimeOffset.UtcNow.AddSeconds(-5), LiveTestProfile.Tdz, "rvr", 1500));
            }
            SqliteConnection.ClearAllPools();
            var db = Path.Combine(folder, EngineServiceCollectionExtensions.DatabaseFileName);
            await using (var connection = new SqliteConnection($"Data Source={db};Pooling=False"))
            {
                await connection.OpenAsync();
                await using var command = connection.CreateCommand();
                command.CommandText = "PRAGMA journal_mode=DELETE;";
                Assert.Equal("delete", (string?)await command.ExecuteScalarAsync());
            }

            await using var second = OpsLvpApp.Start(LiveTestProfile.Settings(profile), folder);
            await LiveClient.PushAsync(second, LiveClient.Item(DateTimeOffset.UtcNow.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 1400));
            Assert.Contains(await LiveClient.EntriesAsync(second), e => e.Kind == "journal_mode_switched");
            await using var check = new SqliteConnection($"Data Source={db};Pooling=False");
            await check.OpenAsync();
            await using var mode = check.CreateCommand();
            mode.CommandText = "PRAGMA journal_mode;";
            Assert.Equal("wal", (string?)await mode.ExecuteScalarAsync());
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }
}
