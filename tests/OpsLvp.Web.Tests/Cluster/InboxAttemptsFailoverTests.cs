using System.Net;
using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using Npgsql;
using OpsLvp.Data;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// A failing inbox batch's attempts are counted on its row in the database, so a new leader goes on counting instead of
/// starting again (docs/engine.md R82; docs/deployment.md "Readings from any node"): two real apps on Kestrel on a
/// throwaway PostgreSQL cluster. The batch fails for a real fault of the real database: a CHECK constraint the test adds
/// to the readings table refuses one invented value. Readings and the profile are invented (the live test profile). The
/// node names are the test's own: other tests on the shared throwaway cluster find their nodes' sessions by name.
/// </summary>
public sealed class InboxAttemptsFailoverTests
{
    /// <summary>An invented RVR value (inside the profile's range, so it is accepted) that the test's constraint refuses.</summary>
    private const double Refused = 4321;

    [PostgresFact]
    public async Task AttemptsOnTheOldLeader_CountOnTheNewOne_SoItSetsTheBatchAsideAtTheLimit()
    {
        using var db = ProviderDatabase.Create(OpsLvpDatabase.PostgresProvider);
        var shared = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(shared);
        try
        {
            var profile = LiveTestProfile.Write(shared);
            var settingsA = TwoNodeLeadershipTests.Settings(db, profile, shared, "node-p");
            settingsA["Cluster:InboxSetAsideAfter"] = "2";
            // the longest poll allowed: after its failed attempt A tries again only on a wake-up, and the test sends none
            settingsA["Cluster:InboxPollInterval"] = "00:01:00";
            var a = OpsLvpApp.Start(settingsA);
            var disposedA = false;
            try
            {
                await Eventually.TrueAsync(() => a.Services.GetRequiredService<LiveEngineHost>().State is not null, "node-p to lead and restore", TimeSpan.FromSeconds(60));
                var settingsB = TwoNodeLeadershipTests.Settings(db, profile, shared, "node-q");
                settingsB["Cluster:InboxSetAsideAfter"] = "2";
                settingsB["Cluster:InboxPollInterval"] = "00:00:00.2";
                await using var b = OpsLvpApp.Start(settingsB);
                var hostB = b.Services.GetRequiredService<LiveEngineHost>();
                Assert.True(hostB.IsStandby);
                using var logA = new CapturingLoggerProvider();
                a.Services.GetRequiredService<ILoggerFactory>().AddProvider(logA);
                using var logB = new CapturingLoggerProvider();
                b.Services.GetRequiredService<ILoggerFactory>().AddProvider(logB);
                await ExecuteAsync(db, $"ALTER TABLE readings ADD CONSTRAINT invented_fault CHECK (value IS DISTINCT FROM {Refused})");

                // pushed to the standby B; the leader A takes it from the inbox and fails: attempt 1 of 2
                var now = DateTimeOffset.UtcNow;
                Assert.Equal(HttpStatusCode.Accepted, (await StandbyPushTests.PushAsync(b, LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", Refused))).Status);
                var id = Assert.Single(await PostgresNodes.InboxIdsAsync(db));
                await Eventually.TrueAsync(() => FailedAttempts(logA, id).Any(), "node-p's first failed attempt", TimeSpan.FromSeconds(60));
                Assert.Contains("(attempt 1 of 2)", Assert.Single(FailedAttempts(logA, id)), StringComparison.Ordinal);

                // the attempt and its error are on the row, where any leader reads them
                var row = Assert.Single(await InboxAsync(db));
                Assert.Equal(1, row.Attempts);
                Assert.Contains("invented_fault", row.LastError, StringComparison.Ordinal);

                // A stops; B takes over and sets the batch aside at its own first failure: attempt 2 of 2, not 1 of 2 again
                await a.DisposeAsync();
                disposedA = true;
                await Eventually.TrueAsync(() => b.Services.GetRequiredService<OpsLvp.Web.Cluster.ILeadership>().IsLeader, "node-q to take over", TimeSpan.FromSeconds(60));
                await PostgresNodes.WaitInboxEmptyAsync(db);
                var setAside = Assert.Single(await LiveClient.EntriesAsync(b), e => e.Kind == AuditEvents.InboxBatchSetAside);
                using var payload = JsonDocument.Parse(setAside.PayloadJson);
                Assert.Equal(id, payload.RootElement.GetProperty("inboxId").GetInt64());
                Assert.Equal(2, payload.RootElement.GetProperty("attempts").GetInt32());
                Assert.Contains("invented_fault", payload.RootElement.GetProperty("error").GetString(), StringComparison.Ordinal);
                Assert.Empty(FailedAttempts(logB, id));
                Assert.Contains(logB.Lines, l => l.Level == LogLevel.Error && l.Message.Contains($"batch {id} ", StringComparison.Ordinal)
                    && l.Message.Contains("set aside after 2 failed attempt(s)", StringComparison.Ordinal));
                await LiveClient.AssertChainVerifiesAsync(b);
            }
            finally
            {
                if (!disposedA)
                {
                    await a.DisposeAsync();
                }
            }
        }
        finally
        {
            OpsLvpApp.TryDelete(shared);
        }
    }

    /// <summary>The drain's "failed (attempt n of m)" warnings for inbox row <paramref name="id"/> in <paramref name="log"/>.</summary>
    private static List<string> FailedAttempts(CapturingLoggerProvider log, long id) =>
        [.. log.Lines.Where(l => l.Level == LogLevel.Warning && l.Message.Contains($"batch {id} ", StringComparison.Ordinal) && l.Message.Contains(" failed (attempt ", StringComparison.Ordinal))
            .Select(l => l.Message)];

    private static async Task ExecuteAsync(ProviderDatabase db, string sql)
    {
        await using var connection = new NpgsqlConnection(db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync();
    }

    private static async Task<List<(long Id, int Attempts, string? LastError)>> InboxAsync(ProviderDatabase db)
    {
        await using var connection = new NpgsqlConnection(db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT id, attempts, last_error FROM reading_inbox ORDER BY id", connection);
        var rows = new List<(long, int, string?)>();
        await using var reader = await command.ExecuteReaderAsync();
        while (await reader.ReadAsync())
        {
            rows.Add((reader.GetInt64(0), reader.GetInt32(1), reader.IsDBNull(2) ? null : reader.GetString(2)));
        }
        return rows;
    }
}
