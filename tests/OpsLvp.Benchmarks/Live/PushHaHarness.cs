using System.Diagnostics;
using System.Globalization;
using System.Net.Http.Json;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;
using Npgsql;
using OpsLvp.Benchmarks.Reporting;
using OpsLvp.Benchmarks.Services;
using OpsLvp.Data;
using OpsLvp.Web.Access;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// Issue 16: "the leader's snapshots reach every node's pages and hub clients within the same latency budget as
/// today". Reading posted → <c>state</c> received per SignalR client, in one run, for: the bare hub (the budget's
/// baseline), one node on SQLite (today), one node on PostgreSQL, and two nodes on one PostgreSQL database with
/// <c>Cluster:Redis</c> (real <see cref="PostgresLeadership"/> election; readings posted to the leader) with every
/// client on the standby, and with the clients split half and half between leader and standby. Everything in this
/// process on loopback: a throwaway PostgreSQL cluster (<see cref="BenchPostgres"/>), a throwaway redis-server
/// (<see cref="BenchRedis"/>), the nodes on in-process Kestrel (<see cref="BenchServer"/>).
/// </summary>
public static class PushHaHarness
{
    /// <summary>
    /// Live:MaxStatesPerSecond on every node: high, so a round is not held back by the per-subscriber rate limit
    /// (default 4 a second, docs/feeds.md "Live state rate"; rounds 150 ms apart would otherwise wait up to 250 ms for
    /// the interval, the same on one node and two). What is measured is the path, not the limit.
    /// </summary>
    public const string Rate = "1000";

    private const string RateSetting = "Live:MaxStatesPerSecond";

    /// <summary>
    /// Npgsql pool size per connection string. Three nodes share this process and the throwaway cluster allows 100
    /// connections; at Npgsql's default of 100 per pool, 500 hub connections authenticating at once ran the server out
    /// of connections ("53300: sorry, too many clients already").
    /// </summary>
    private const int PoolSize = 40;

    private static string Pooled(string connectionString) =>
        new NpgsqlConnectionStringBuilder(connectionString) { MaxPoolSize = PoolSize }.ConnectionString;

    public static async Task RunAsync(BenchOptions options, ResultsBook book, string command)
    {
        int[] counts = options.Quick ? [1, 20, 100] : [1, 20, 100, 500];
        var rounds = options.Quick ? 5 : 20;
        const string section = "Live push latency through two nodes and Redis (reading posted to the leader → state received, per client)";
        if (BenchPostgres.FindBin() is null || BenchRedis.Find() is null)
        {
            book.Note("push-ha: not measured on this run: PostgreSQL server programs or redis-server not found.");
            return;
        }
        var commit = await PushLatencyHarness.MeasureSqliteAuditCommitAsync(options.Quick ? 10 : 30);
        book.Add(new ResultRow(section, "one audit commit (SQLite FULL, median; the budget's term)", Ms(commit), null, null, null, null, command));

        using var redis = await BenchRedis.StartAsync();
        var shared = Path.Combine(Path.GetTempPath(), "opslvp-bench-ha", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(shared);
        try
        {
            await using var sqlite = BenchServer.Start(new Dictionary<string, string?> { [RateSetting] = Rate });
            await using var pgOne = BenchServer.Start(PostgresSettings(Pooled(BenchPostgres.Shared.CreateDatabase()), shared, "pg-single", null));
            var database = Pooled(BenchPostgres.Shared.CreateDatabase());
            await using var first = BenchServer.Start(PostgresSettings(database, shared, "node-a", redis.Configuration));
            await using var second = BenchServer.Start(PostgresSettings(database, shared, "node-b", redis.Configuration));
            await using var bare = await BareServer.StartAsync();

            await WaitAsync(() => pgOne.Services.GetRequiredService<ILeadership>().IsLeader && pgOne.Services.GetRequiredService<LiveEngineHost>().State is not null,
                "the one PostgreSQL node to lead and restore");
            await WaitAsync(() => first.Services.GetRequiredService<ILeadership>().IsLeader != second.Services.GetRequiredService<ILeadership>().IsLeader,
                "exactly one of the two nodes to lead");
            var (leader, standby) = first.Services.GetRequiredService<ILeadership>().IsLeader ? (first, second) : (second, first);
            await WaitAsync(() => leader.Services.GetRequiredService<LiveEngineHost>().State is not null, "the leader to restore its engine");
            var leaderName = leader.Services.GetRequiredService<ILeadership>().NodeId;
            var standbyName = standby.Services.GetRequiredService<ILeadership>().NodeId;

            var sqliteKey = await sqlite.IssuePushKeyAsync();
            var pgKey = await pgOne.IssuePushKeyAsync();
            var haKey = await leader.IssuePushKeyAsync();
            using var http = new HttpClient { Timeout = TimeSpan.FromSeconds(20) };
            var value = 1500;
            Func<Task> PostTo(BenchServer target, string key) => async () =>
            {
                value = PushLatencyHarness.NextValue(value);
                var body = new { readings = new[] { new { time = TimeProvider.System.GetUtcNow().ToString("O", CultureInfo.InvariantCulture), sensor = PushLatencyHarness.Sensor, kind = "rvr", value, status = "ok" } } };
                using var request = new HttpRequestMessage(HttpMethod.Post, new Uri(target.BaseAddress, "/api/readings")) { Content = JsonContent.Create(body) };
                request.Headers.Add(ApiKeyAuthenticationHandler.Header, key);
                using var response = await http.SendAsync(request);
                response.EnsureSuccessStatusCode();
            };
            string? Marker() => string.Create(CultureInfo.InvariantCulture, $":{PushLatencyHarness.NextValue(value)}");
            static List<(string, Uri)> On(int n, params (string Group, BenchServer Server)[] nodes) =>
                Enumerable.Range(0, n).Select(i => (nodes[i % nodes.Length].Group, new Uri(nodes[i % nodes.Length].Server.BaseAddress, "/hubs/lvp"))).ToList();
            var bareHubs = Enumerable.Range(0, counts[^1]).Select(_ => ("bare", new Uri(bare.BaseAddress, "/hubs/bare"))).ToList();

            var payloadChars = 0;
            var duplicates = new List<string>();
            foreach (var n in counts)
            {
                Progress($"{n} clients");
                var one = await PushLatencyHarness.MeasureGroupsAsync(On(n, ("sqlite", sqlite)), sqliteKey, rounds, Marker, PostTo(sqlite, sqliteKey));
                payloadChars = Math.Max(payloadChars, one.PayloadChars);
                BareServer.PayloadChars = payloadChars > 0 ? payloadChars : 4096;
                var bareRun = await PushLatencyHarness.MeasureGroupsAsync(bareHubs.Take(n).ToList(), null, rounds, () => null, async () =>
                {
                    using var response = await http.PostAsync(new Uri(bare.BaseAddress, "/bare"), null);
                    response.EnsureSuccessStatusCode();
                });
                var pg = await PushLatencyHarness.MeasureGroupsAsync(On(n, ("pg", pgOne)), pgKey, rounds, Marker, PostTo(pgOne, pgKey));
                var allOnStandby = await PushLatencyHarness.MeasureGroupsAsync(On(n, ("standby", standby)), haKey, rounds, Marker, PostTo(leader, haKey));
                var split = n < 2 ? default : await PushLatencyHarness.MeasureGroupsAsync(On(n, ("leader", leader), ("standby", standby)), haKey, rounds, Marker, PostTo(leader, haKey));

                var bareP99 = bareRun.ByGroup["bare"].P99;
                var budget = bareP99 + commit + 5;
                string Verdict(Latencies l) => string.Create(CultureInfo.InvariantCulture,
                    $"{(l.P99 <= budget ? "met" : "MISSED")}: p99 ≤ bare p99 + commit + 5 ms = {budget:0.00} ms ({(l.P99 <= budget ? "spare" : "over by")} {Math.Abs(budget - l.P99):0.00} ms)");
                void Row(string what, Latencies l, double reference, string referenceName) =>
                    book.Add(new ResultRow(section, $"{what}, {n} clients: {l}", Ms(l.P99), l.P99 / reference, referenceName, null, Verdict(l), command));

                book.Add(new ResultRow(section, $"bare hub, {n} clients: {bareRun.ByGroup["bare"]}", Ms(bareP99), null, null, null, null, command));
                var sqliteP99 = one.ByGroup["sqlite"].P99;
                Row("one node, SQLite", one.ByGroup["sqlite"], bareP99, "bare p99");
                Row("one node, PostgreSQL", pg.ByGroup["pg"], sqliteP99, "SQLite one-node p99");
                Row($"two nodes, all clients on the standby ({standbyName})", allOnStandby.ByGroup["standby"], sqliteP99, "SQLite one-node p99");
                if (split.ByGroup is not null)
                {
                    Row($"two nodes, split: the {n / 2 + n % 2} on the leader ({leaderName})", split.ByGroup["leader"], sqliteP99, "SQLite one-node p99");
                    Row($"two nodes, split: the {n / 2} on the standby ({standbyName})", split.ByGroup["standby"], sqliteP99, "SQLite one-node p99");
                }
                duplicates.Add(string.Create(CultureInfo.InvariantCulture,
                    $"{n} clients: one node SQLite {one.DeliveriesPerRound:0.00}, PostgreSQL {pg.DeliveriesPerRound:0.00}, all on standby {allOnStandby.DeliveriesPerRound:0.00}{(split.ByGroup is null ? "" : $", split {split.DeliveriesPerRound:0.00}")}"));
            }
            book.Note(string.Create(CultureInfo.InvariantCulture,
                $"push-ha: {rounds} rounds per client count and configuration, 150 ms apart, state payload up to {payloadChars} characters; leader {leaderName}, standby {standbyName}; Live:MaxStatesPerSecond={Rate} on every node; Npgsql pool {PoolSize} per database; one PostgreSQL cluster (max_connections 100) and one redis-server on loopback, all nodes and clients in one process."));
            book.Note("push-ha: state messages of the awaited snapshot version received per client per round (1.00 = each snapshot once): " + string.Join("; ", duplicates) + ".");
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            NpgsqlConnection.ClearAllPools();
            BenchFiles.TryDeleteFolder(shared);
        }
    }

    /// <summary>A node on PostgreSQL <paramref name="connectionString"/>; with <paramref name="redis"/>, in the cluster (shared anchor key, own anchor log).</summary>
    private static Dictionary<string, string?> PostgresSettings(string connectionString, string shared, string node, string? redis)
    {
        var settings = new Dictionary<string, string?>
        {
            [OpsLvpDatabase.ProviderSetting] = OpsLvpDatabase.PostgresProvider,
            [OpsLvpDatabase.PostgresConnectionStringSetting] = connectionString,
            ["Cluster:NodeId"] = node,
            [RateSetting] = Rate,
            // one installation, one anchor key (docs/audit.md "Anchors"); each node its own anchor log
            ["Anchors:KeyPath"] = Path.Combine(shared, redis is null ? node + "-anchor-key.pem" : "anchor-key.pem"),
            ["Anchors:LogPath"] = Path.Combine(shared, node + "-anchors.jsonl"),
        };
        if (redis is not null)
        {
            settings["Cluster:Redis"] = redis;
        }
        return settings;
    }

    private static async Task WaitAsync(Func<bool> condition, string what)
    {
        var clock = Stopwatch.StartNew();
        while (!condition())
        {
            if (clock.Elapsed > TimeSpan.FromMinutes(2))
            {
                throw new TimeoutException($"push-ha: waited 2 minutes for {what}");
            }
            await Task.Delay(100);
        }
    }

    private static void Progress(string what) =>
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"[push-ha {TimeProvider.System.GetUtcNow():HH:mm:ss}] {what}"));

    private static string Ms(double ms) => string.Create(CultureInfo.InvariantCulture, $"{ms:0.00} ms");
}
