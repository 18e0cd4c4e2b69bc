using System.Net;
using System.Text.Json;
using Npgsql;
using OpsLvp.Cli;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Tests.Access;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Persistence;

/// <summary>
/// <c>opslvp audit verify</c> on a PostgreSQL connection string, and <c>opslvp migrate</c> from a SQLite installation
/// made by the real app to a database of the test cluster, which the real app then runs on. Data is invented.
/// </summary>
public sealed class PostgresCliTests
{
    private static readonly DateTimeOffset s_t0 = new(2026, 1, 2, 3, 0, 0, TimeSpan.Zero);

    [PostgresFact]
    public async Task AuditVerify_OnAPostgresConnectionString_ReportsTheChain_AndNamesATamperedSequence()
    {
        using var db = await ProviderDatabase.CreateMigratedAsync(OpsLvpDatabase.PostgresProvider);
        using (var store = new AuditStore(db.Factory))
        {
            await store.AppendAsync([Entry(1), Entry(2), Entry(3)]);
        }

        var (code, stdout, stderr) = Run("audit", "verify", "--db", db.ConnectionString);
        Assert.Equal(0, code);
        Assert.Equal("", stderr);
        Assert.Equal(3, JsonDocument.Parse(stdout).RootElement.GetProperty("entries").GetInt64());

        await db.ExecuteRawAsync("DROP TRIGGER audit_entries_no_update ON audit_entries; UPDATE audit_entries SET actor = 'someone.else' WHERE sequence = 2");
        (code, stdout, _) = Run("audit", "verify", "--db", db.ConnectionString);
        Assert.Equal(AuditVerifyCommandExitCodes.ChainBroken, code);
        Assert.Equal(2, JsonDocument.Parse(stdout).RootElement.GetProperty("first_bad_sequence").GetInt64());
    }

    [PostgresFact]
    public void AuditVerify_OnAnUnreachableServer_ExitsOne_WithoutPrintingThePassword()
    {
        var closed = new NpgsqlConnectionStringBuilder
        {
            Host = "127.0.0.1",
            Port = LocalServices.FreePort(),
            Database = "opslvp",
            Username = "opslvp",
            Password = "invented-secret-pw",
            Timeout = 3,
        }.ConnectionString;

        var (code, stdout, stderr) = Run("audit", "verify", "--db", closed);

        Assert.Equal(1, code);
        Assert.Equal("", stdout);
        Assert.Contains("PostgreSQL database 'opslvp' on 127.0.0.1", stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("invented-secret-pw", stderr, StringComparison.Ordinal);
    }

    [PostgresFact]
    public async Task Migrate_CopiesAnInstallation_ThatTheAppThenRunsOnPostgres_WithStateAccountsKeysAndChain()
    {
        using var source = ProviderDatabase.Create(OpsLvpDatabase.SqliteProvider);
        var folder = OpsLvpApp.NewDataFolder();
        var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
        settings["Access:SetupSecret"] = AccessApp.SetupSecret;
        settings["Access:SignInPerAddressPerMinute"] = "1000";
        settings["Access:SignInAttemptsPerAccount"] = "1000";
        settings["Access:SignInAttemptsPerAccountAllAddresses"] = "1000";
        try
        {
            // an installation on SQLite: a phase, an account with a session, an API key, readings, a chain
            string readerKey;
            Cookie session;
            long sourceEntries;
            await using (var before = OpsLvpApp.Start(With(settings, source.AppSettings), folder))
            {
                await LiveClient.PushAsync(before, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 900));
                await LiveClient.WaitForPhaseAsync(before, "preparation", TimeSpan.FromSeconds(60));
                await before.CreateUserAsync("v.migrate", Roles.Viewer);
                using var person = AccessClient.For(before);
                (await person.SignInAsync("v.migrate", AccessApp.Password)).Dispose();
                session = person.Cookies.GetAllCookies().Single(c => c.Name == Web.Access.AccessSchemes.SessionCookieName);
                readerKey = await LiveClient.ReaderKeyAsync(before);
                sourceEntries = (await LiveClient.Audit(before).GetHeadAsync())!.Sequence;
            }
            var file = new Microsoft.Data.Sqlite.SqliteConnectionStringBuilder(source.ConnectionString).DataSource;
            var target = PostgresCluster.Shared.CreateDatabase();

            var (code, stdout, stderr) = Run("migrate", "--from", file, "--to", target);

            Assert.True(code == 0, stderr);
            var json = JsonDocument.Parse(stdout).RootElement;
            Assert.True(json.GetProperty("ok").GetBoolean());
            Assert.Equal(sourceEntries, json.GetProperty("entries").GetInt64());
            var tables = json.GetProperty("tables");
            Assert.True(tables.GetProperty("readings").GetInt64() >= 1);
            Assert.Equal(1, tables.GetProperty("engine_state").GetInt64());
            Assert.Equal(1, tables.GetProperty("users").GetInt64());
            Assert.True(tables.GetProperty("api_keys").GetInt64() >= 1);
            Assert.True(tables.GetProperty("data_protection_keys").GetInt64() >= 1);
            Assert.Equal(sourceEntries, tables.GetProperty("audit_entries").GetInt64());

            // the app on PostgreSQL, with a fresh data folder but the installation's anchor key and log (they move with it,
            // docs/deployment.md "Moving an installation from SQLite"): state restored, the old session and key work, the
            // chain continues
            var pgFolder = OpsLvpApp.NewDataFolder();
            var sourceAnchors = Path.TrimEndingDirectorySeparator(folder) + "-anchors";
            var pgSettings = With(LiveTestProfile.Settings(LiveTestProfile.Write(pgFolder)), new()
            {
                [OpsLvpDatabase.ProviderSetting] = OpsLvpDatabase.PostgresProvider,
                [OpsLvpDatabase.PostgresConnectionStringSetting] = target,
                ["Anchors:KeyPath"] = Path.Combine(sourceAnchors, "anchor-key.pem"),
                ["Anchors:LogPath"] = Path.Combine(sourceAnchors, "anchors.jsonl"),
            });
            await using (var after = OpsLvpApp.Start(pgSettings, pgFolder))
            {
                using var stateRequest = new HttpRequestMessage(HttpMethod.Get, new Uri("/api/state", UriKind.Relative));
                stateRequest.Headers.Add(Web.Access.ApiKeyAuthenticationHandler.Header, readerKey);
                using var state = await after.Client.SendAsync(stateRequest);
                Assert.Equal(HttpStatusCode.OK, state.StatusCode);
                Assert.Equal("preparation", LiveClient.Phase(JsonDocument.Parse(await state.Content.ReadAsStringAsync()).RootElement));

                using var cookieClient = new HttpClient(new HttpClientHandler { UseCookies = false, AllowAutoRedirect = false }) { BaseAddress = after.BaseAddress };
                cookieClient.DefaultRequestHeaders.Add("Cookie", $"{session.Name}={session.Value}");
                using var signedIn = await cookieClient.GetAsync(new Uri("/api/state", UriKind.Relative));
                Assert.Equal(HttpStatusCode.OK, signedIn.StatusCode);

                using var person = AccessClient.For(after);
                using var signIn = await person.SignInAsync("v.migrate", AccessApp.Password);
                Assert.True(person.HasCookie(Web.Access.AccessSchemes.SessionCookieName));

                var entries = await LiveClient.EntriesAsync(after);
                Assert.True(entries.Count > sourceEntries);
                Assert.Contains("\"restored\":true", entries.Last(e => e.Kind == "engine_started").PayloadJson, StringComparison.Ordinal);
            }
            OpsLvpApp.TryDelete(pgFolder);
            (code, stdout, _) = Run("audit", "verify", "--db", target);
            Assert.Equal(0, code);
            Assert.True(JsonDocument.Parse(stdout).RootElement.GetProperty("entries").GetInt64() > sourceEntries);

            // a second migrate into the now non-empty target is refused and changes nothing
            var countBefore = JsonDocument.Parse(stdout).RootElement.GetProperty("entries").GetInt64();
            (code, _, stderr) = Run("migrate", "--from", file, "--to", target);
            Assert.Equal(1, code);
            Assert.Contains("already holds rows", stderr, StringComparison.Ordinal);
            (_, stdout, _) = Run("audit", "verify", "--db", target);
            Assert.Equal(countBefore, JsonDocument.Parse(stdout).RootElement.GetProperty("entries").GetInt64());
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [PostgresFact]
    public async Task Migrate_FromATamperedSource_CopiesNothing()
    {
        using var source = await ProviderDatabase.CreateMigratedAsync(OpsLvpDatabase.SqliteProvider);
        using (var store = new AuditStore(source.Factory))
        {
            await store.AppendAsync([Entry(1), Entry(2)]);
        }
        await source.ExecuteRawAsync("DROP TRIGGER audit_entries_no_update; UPDATE audit_entries SET actor = 'someone.else' WHERE sequence = 1;");
        var target = PostgresCluster.Shared.CreateDatabase();

        var (code, stdout, stderr) = Run("migrate", "--from", new Microsoft.Data.Sqlite.SqliteConnectionStringBuilder(source.ConnectionString).DataSource, "--to", target);

        Assert.Equal(1, code);
        Assert.Equal("", stdout);
        Assert.Contains("does not verify", stderr, StringComparison.Ordinal);
        await using var connection = new NpgsqlConnection(target);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT to_regclass('audit_entries') IS NULL", connection);
        Assert.True((bool)(await command.ExecuteScalarAsync())!); // not even migrated
    }

    [Theory]
    [InlineData("migrate", "--from", "x.db")]
    [InlineData("migrate", "--from", "x.db", "--to", "not-a-connection-string")]
    [InlineData("migrate", "--to", "Host=127.0.0.1;Database=opslvp")]
    public void Migrate_BadCommandLine_ExitsTwo(params string[] args)
    {
        var (code, _, stderr) = Run(args);

        Assert.Equal(2, code);
        Assert.Contains("migrate --from", stderr, StringComparison.Ordinal);
    }

    private static Dictionary<string, string?> With(Dictionary<string, string?> settings, Dictionary<string, string?> more)
    {
        var all = new Dictionary<string, string?>(settings);
        foreach (var (key, value) in more)
        {
            all[key] = value;
        }
        return all;
    }

    private static NewAuditEntry Entry(int n) =>
        new("dm.invented", "transition", $"{{\"n\":{n},\"note\":\"invented\"}}", s_t0.AddSeconds(n));

    private static (int Code, string Stdout, string Stderr) Run(params string[] args)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    private static class AuditVerifyCommandExitCodes
    {
        public const int ChainBroken = OpsLvp.Cli.Commands.AuditVerifyCommand.ChainBrokenExitCode;
    }
}
