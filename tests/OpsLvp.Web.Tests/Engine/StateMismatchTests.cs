using System.Net;
using System.Text;
using Microsoft.Data.Sqlite;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// The last audit entries deleted from a stopped server's database: the next start stops the engine, naming the
/// mismatch, until an administrator acknowledges it (docs/reliability.md "Tamper evidence"). Readings are invented.
/// </summary>
public sealed class StateMismatchTests
{
    [Fact]
    public async Task ChainCutShorterThanTheStoredState_StopsTheEngine_NamingIt_UntilAcknowledged()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var profile = LiveTestProfile.Write(folder);
            await using (var first = OpsLvpApp.Start(LiveTestProfile.Settings(profile), folder))
            {
                await LiveClient.PushAsync(first, LiveClient.Item(DateTimeOffset.UtcNow.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 900));
            }
            SqliteConnection.ClearAllPools();
            var db = Path.Combine(folder, EngineServiceCollectionExtensions.DatabaseFileName);
            long head;
            await using (var connection = new SqliteConnection($"Data Source={db};Pooling=False"))
            {
                await connection.OpenAsync();
                await using var cut = connection.CreateCommand();
                // someone with write access to the file drops the append-only trigger first
                cut.CommandText = "DROP TRIGGER audit_entries_no_delete; DELETE FROM audit_entries WHERE sequence >= (SELECT audit_sequence FROM engine_state) - 1; SELECT MAX(sequence) FROM audit_entries;";
                head = (long)(await cut.ExecuteScalarAsync())!;
            }

            await using (var stopped = OpsLvpApp.Start(LiveTestProfile.Settings(profile), folder))
            {
                var health = await stopped.GetHealthAsync();
                Assert.Equal("failing", health.GetProperty("status").GetString());
                var reason = health.GetProperty("engine").GetProperty("stopped").GetString();
                Assert.Contains($"the audit chain ends at {head}: entries were removed", reason, StringComparison.Ordinal);
                Assert.Contains($"Engine:AcknowledgeStateMismatch={head}", reason, StringComparison.Ordinal);
                using var push = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
                {
                    Content = new StringContent("{ \"readings\": [" + LiveClient.Item(DateTimeOffset.UtcNow.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 900) + "] }", Encoding.UTF8, "application/json"),
                };
                push.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
                using var refused = await stopped.Client.SendAsync(push);
                Assert.Equal(HttpStatusCode.ServiceUnavailable, refused.StatusCode);
            }
            SqliteConnection.ClearAllPools();

            var acknowledging = LiveTestProfile.Settings(profile);
            acknowledging["Engine:AcknowledgeStateMismatch"] = head.ToString(System.Globalization.CultureInfo.InvariantCulture);
            await using var resumed = OpsLvpApp.Start(acknowledging, folder);
            Assert.Equal("ok", (await resumed.GetHealthAsync()).GetProperty("status").GetString());
            var entries = await LiveClient.EntriesAsync(resumed);
            var ack = Assert.Single(entries, e => e.Kind == "state_mismatch_acknowledged");
            Assert.Contains(entries, e => e.Kind == "engine_started" && e.Sequence > head); // the engine runs again
            Assert.Contains("entries were removed", ack.PayloadJson, StringComparison.Ordinal);
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }
}
