using System.Diagnostics;
using System.Net;
using System.Text;
using Microsoft.Data.Sqlite;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;

namespace OpsLvp.Web.Tests.Live;

/// <summary>
/// The real server as a separate process (dotnet OpsLvp.Web.dll), killed with SIGKILL during a burst of pushed
/// readings, then restarted on the same data folder. Readings are invented.
/// </summary>
public sealed class ServerCrashTests
{
    [Fact]
    public async Task ServerKilledDuringABurst_RestartsWithAnIntactDatabase_AVerifyingChainWithoutGaps_AndItsState()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var profile = LiveTestProfile.Write(folder);
            var db = Path.Combine(folder, EngineServiceCollectionExtensions.DatabaseFileName);
            var value = 0;
            foreach (var killAfter in new[] { 400, 1100, 1900 }) // ms of burst before the kill, invented
            {
                using (var server = await ServerProcess.StartAsync(folder, profile))
                {
                    var stopwatch = Stopwatch.StartNew();
                    var t = DateTimeOffset.UtcNow;
                    while (stopwatch.ElapsedMilliseconds < killAfter)
                    {
                        // alternate across the thresholds so transitions and dwells are in flight when killed
                        var rvr = (value++ % 3) switch { 0 => 900, 1 => 500, _ => 1500 };
                        t = t.AddMilliseconds(10);
                        await server.PushAsync(LiveClient.Item(t, LiveTestProfile.Tdz, "rvr", rvr));
                    }
                    server.Kill();
                }
                await AssertDatabaseIntactAsync(db);
            }
            using (var last = await ServerProcess.StartAsync(folder, profile))
            {
                using var health = await last.Client.GetAsync(new Uri("/health", UriKind.Relative));
                Assert.Equal(HttpStatusCode.OK, health.StatusCode);
                last.Kill();
            }
            var store = new AuditStore(new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions($"Data Source={db}")));
            var head = await store.GetHeadAsync();
            var entries = await store.GetRangeAsync(1, head!.Sequence);
            // four starts, and every start after the first restored the saved state
            var starts = entries.Where(e => e.Kind == "engine_started").ToList();
            Assert.Equal(4, starts.Count);
            Assert.All(starts.Skip(1), s => Assert.Contains("\"restored\":true", s.PayloadJson, StringComparison.Ordinal));
            await AssertDatabaseIntactAsync(db);
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }

    /// <summary>The same kill -9 test on PostgreSQL: the server process's database is on the test cluster.</summary>
    [PostgresFact]
    public async Task ServerKilledDuringABurst_OnPostgres_RestartsWithAVerifyingChainWithoutGaps_AndItsState()
    {
        using var database = ProviderDatabase.Create(OpsLvpDatabase.PostgresProvider);
        var environment = new Dictionary<string, string>
        {
            ["OpsLvp__Database__Provider"] = OpsLvpDatabase.PostgresProvider,
            ["ConnectionStrings__OpsLvp"] = database.ConnectionString,
        };
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var profile = LiveTestProfile.Write(folder);
            var value = 0;
            foreach (var killAfter in new[] { 400, 1100, 1900 }) // ms of burst before the kill, invented
            {
                using (var server = await ServerProcess.StartAsync(folder, profile, environment))
                {
                    var stopwatch = Stopwatch.StartNew();
                    var t = DateTimeOffset.UtcNow;
                    while (stopwatch.ElapsedMilliseconds < killAfter)
                    {
                        var rvr = (value++ % 3) switch { 0 => 900, 1 => 500, _ => 1500 };
                        t = t.AddMilliseconds(10);
                        await server.PushAsync(LiveClient.Item(t, LiveTestProfile.Tdz, "rvr", rvr));
                    }
                    server.Kill();
                }
                await AssertChainAndStateAsync(new AuditStore(database.NewFactory()));
            }
            using (var last = await ServerProcess.StartAsync(folder, profile, environment))
            {
                using var health = await last.Client.GetAsync(new Uri("/health", UriKind.Relative));
                Assert.Equal(HttpStatusCode.OK, health.StatusCode);
                last.Kill();
            }
            using var store = new AuditStore(database.NewFactory());
            var head = await store.GetHeadAsync();
            var entries = await store.GetRangeAsync(1, head!.Sequence);
            Assert.Equal(Enumerable.Range(1, (int)head.Sequence).Select(i => (long)i), entries.Select(e => e.Sequence));
            var starts = entries.Where(e => e.Kind == "engine_started").ToList();
            Assert.Equal(4, starts.Count);
            Assert.All(starts.Skip(1), s => Assert.Contains("\"restored\":true", s.PayloadJson, StringComparison.Ordinal));
            await AssertChainAndStateAsync(store);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static async Task AssertDatabaseIntactAsync(string db)
    {
        await using (var connection = new SqliteConnection($"Data Source={db};Pooling=False"))
        {
            await connection.OpenAsync();
            await using var integrity = connection.CreateCommand();
            integrity.CommandText = "PRAGMA integrity_check;";
            Assert.Equal("ok", (string?)await integrity.ExecuteScalarAsync());
            await using var gaps = connection.CreateCommand();
            gaps.CommandText = "SELECT COUNT(*) = MAX(sequence) AND MIN(sequence) = 1 FROM audit_entries;";
            Assert.Equal(1L, (long)(await gaps.ExecuteScalarAsync())!);
        }
        var store = new AuditStore(new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions($"Data Source={db};Pooling=False")));
        await AssertChainAndStateAsync(store);
    }

    private static async Task AssertChainAndStateAsync(AuditStore store)
    {
        var verification = await store.VerifyAsync();
        Assert.True(verification.Ok, verification.Detail);
        var state = await store.GetLatestStateAsync();
        var head = await store.GetHeadAsync();
        Assert.NotNull(state);
        Assert.Equal(head!.Sequence, state.AuditSequence);
        _ = EngineStateJson.Deserialize(state.StateJson);
    }

    private sealed class ServerProcess : IDisposable
    {
        private readonly Process _process;

        private ServerProcess(Process process, Uri baseAddress)
        {
            _process = process;
            Client = new HttpClient { BaseAddress = baseAddress, Timeout = TimeSpan.FromSeconds(10) };
        }

        public HttpClient Client { get; }

        public static async Task<ServerProcess> StartAsync(string folder, string profile, IReadOnlyDictionary<string, string>? environment = null)
        {
            var dll = Path.Combine(AppContext.BaseDirectory, "OpsLvp.Web.dll");
            var start = new ProcessStartInfo("dotnet")
            {
                WorkingDirectory = AppContext.BaseDirectory,
                RedirectStandardOutput = true,
                RedirectStandardError = true,
                UseShellExecute = false,
            };
            start.ArgumentList.Add(dll);
            start.ArgumentList.Add("--urls");
            // port 0: Kestrel takes a free port itself and says which; a port picked here and bound later may meanwhile be
            // taken by another test's server, which would then answer in its place
            start.ArgumentList.Add("http://127.0.0.1:0");
            start.Environment["Storage__DataFolder"] = folder;
            start.Environment["Engine__ProfilePath"] = profile;
            start.Environment["Demo__Simulator"] = "Off";
            start.Environment["Feeds__Push__ApiKeys__0__Name"] = "crash-test";
            start.Environment["Feeds__Push__ApiKeys__0__Key"] = LiveTestProfile.PushKey;
            start.Environment["Logging__LogLevel__Default"] = "Warning";
            start.Environment["Logging__LogLevel__Microsoft.Hosting.Lifetime"] = "Information";
            foreach (var (key, value) in environment ?? new Dictionary<string, string>())
            {
                start.Environment[key] = value;
            }
            var process = Process.Start(start)!;
            var listening = new TaskCompletionSource<Uri>(TaskCreationOptions.RunContinuationsAsynchronously);
            void Watch(string? line)
            {
                if (line is not null && ListeningLine.Match(line) is { Success: true } m)
                {
                    listening.TrySetResult(new Uri(m.Groups[1].Value));
                }
            }
            process.OutputDataReceived += (_, e) => Watch(e.Data);
            process.ErrorDataReceived += (_, e) => Watch(e.Data);
            process.BeginOutputReadLine();
            process.BeginErrorReadLine();
            var deadline = DateTime.UtcNow.AddSeconds(90); // generous: a loaded CI machine can take tens of seconds to start
            while (!listening.Task.IsCompleted)
            {
                if (process.HasExited || DateTime.UtcNow > deadline)
                {
                    var exited = process.HasExited;
                    if (!exited)
                    {
                        process.Kill(entireProcessTree: true);
                    }
                    process.Dispose();
                    throw new Xunit.Sdk.XunitException($"server did not come up (exited: {exited})");
                }
                await Task.Delay(100);
            }
            var server = new ServerProcess(process, await listening.Task);
            while (true)
            {
                try
                {
                    using var response = await server.Client.GetAsync(new Uri("/health", UriKind.Relative));
                    if (response.StatusCode == HttpStatusCode.OK)
                    {
                        return server;
                    }
                }
                catch (HttpRequestException)
                {
                }
                catch (TaskCanceledException)
                {
                    // the 10 s client timeout: a loaded machine's first request can take that long; the deadline decides
                }
                if (process.HasExited || DateTime.UtcNow > deadline)
                {
                    server.Kill();
                    throw new Xunit.Sdk.XunitException($"server did not come up (exited: {process.HasExited})");
                }
                await Task.Delay(100);
            }
        }

        public async Task PushAsync(string item)
        {
            using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
            {
                Content = new StringContent("{ \"readings\": [" + item + "] }", Encoding.UTF8, "application/json"),
            };
            request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
            using var response = await Client.SendAsync(request);
            // 503 is the push API's back-pressure when the pipeline is full: the feed retries later
            Assert.True(response.StatusCode is HttpStatusCode.Accepted or HttpStatusCode.ServiceUnavailable, $"push answered {(int)response.StatusCode}");
        }

        public void Kill()
        {
            if (!_process.HasExited)
            {
                _process.Kill(entireProcessTree: true); // SIGKILL
                _process.WaitForExit();
            }
        }

        public void Dispose()
        {
            Kill();
            Client.Dispose();
            _process.Dispose();
        }

        private static readonly System.Text.RegularExpressions.Regex ListeningLine = new(@"Now listening on:\s*(http://\S+)", System.Text.RegularExpressions.RegexOptions.CultureInvariant);
    }
}
