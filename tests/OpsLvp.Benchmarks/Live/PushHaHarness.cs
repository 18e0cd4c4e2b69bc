using System.Globalization;
using System.Net.Http.Json;
using Microsoft.Data.Sqlite;
using Npgsql;
using OpsLvp.Benchmarks.Reporting;
using OpsLvp.Benchmarks.Services;
using OpsLvp.Web.Access;
using OpsLvp.Web.Cluster;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// Issue 16: "the leader's snapshots reach every node's pages and hub clients within the same latency budget as
/// today", target "push p99 through two nodes and Redis ≤ one-node p99 + 2 ms on loopback". Reading posted →
/// <c>state</c> received per SignalR client, in one run, for: the bare hub (the budget's baseline), one node on SQLite
/// (today), one node on PostgreSQL (the target's reference: the two nodes share a PostgreSQL database), and two nodes
/// on one PostgreSQL database with <c>Cluster:Redis</c> (real <see cref="PostgresLeadership"/> election; readings
/// posted to the leader) with every client on the standby, and (a second pair of nodes, its own database and Redis
/// prefix) with the clients split half and half between leader and standby. All configurations stay connected and
/// are measured round by round in rotation (<see cref="PushLatencyHarness.MeasureInterleavedAsync"/>), so load that
/// drifts during the run hits them alike. On loopback: a throwaway PostgreSQL cluster (<see cref="BenchPostgres"/>), a
/// throwaway redis-server (<see cref="BenchRedis"/>), each node on Kestrel in a process of its own as a deployment has
/// it (<see cref="NodeProcess"/>; all in this one with <c>--nodes-in-process</c>), and the measuring hub clients in a
/// process of their own too (<see cref="ProbeProcess"/>; in this one with <c>--clients-in-process</c>). This process
/// starts PostgreSQL and Redis, posts the readings (t0 taken here), runs the rotation and writes the report.
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

    private const string Suite = "push-ha";

    /// <summary>
    /// Npgsql pool size per connection string with <c>--nodes-in-process</c>: five nodes share this process (three
    /// connection strings, so a pair shares one pool) and the throwaway cluster allows 100 connections; at Npgsql's
    /// default of 100 per pool, 500 hub connections authenticating at once ran the server out of connections
    /// ("53300: sorry, too many clients already").
    /// </summary>
    private const int SharedPoolSize = 25;

    /// <summary>
    /// Npgsql pool size of each node in a process of its own (each its own pool): five nodes on PostgreSQL, each with
    /// up to this many pooled connections and two unpooled sessions (leadership, inbox LISTEN: <c>DedicatedSession</c>),
    /// 5 × (16 + 2) = 90 of the cluster's 100 (3 of them reserved for superusers, PostgreSQL's default).
    /// </summary>
    private const int NodePoolSize = 16;

    /// <summary>Issue 16's benchmark target: two-node p99 ≤ one-node p99 (PostgreSQL, the two nodes' database) + this, in ms.</summary>
    public const double TargetSlackMs = 2;

    private static string Pooled(string connectionString, int poolSize) =>
        new NpgsqlConnectionStringBuilder(connectionString) { MaxPoolSize = poolSize }.ConnectionString;

    public static async Task RunAsync(BenchOptions options, ResultsBook book, string command)
    {
        int[] defaultCounts = options.Quick ? [1, 20, 100] : [1, 20, 100, 500];
        var counts = options.ClientCounts ?? defaultCounts;
        var rounds = options.Rounds ?? (options.Quick ? 5 : 60);
        var host = options.ClientsInProcess ? ClientHost.InProcess : ClientHost.OwnProcess;
        Func<NodeSpec, Task<IPushNode>> start = options.NodesInProcess ? LocalNode.StartAsync : NodeProcess.StartAsync;
        var poolSize = options.NodesInProcess ? SharedPoolSize : NodePoolSize;
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
            Progress(options.NodesInProcess ? "starting the nodes in this process" : "starting the nodes, each in a process of its own");
            await using var sqlite = await start(new("sqlite", new() { [RateSetting] = Rate }));
            await using var pgOne = await start(new("pg-single", PostgresSettings(Pooled(BenchPostgres.Shared.CreateDatabase(), poolSize), shared, "pg-single", null)));
            var database = Pooled(BenchPostgres.Shared.CreateDatabase(), poolSize);
            await using var first = await start(new("node-a", PostgresSettings(database, shared, "node-a", redis.Configuration)));
            await using var second = await start(new("node-b", PostgresSettings(database, shared, "node-b", redis.Configuration)));
            // the split layout on a second pair, so both layouts stay connected and are measured in turn
            var splitDatabase = Pooled(BenchPostgres.Shared.CreateDatabase(), poolSize);
            await using var third = await start(new("node-c", PostgresSettings(splitDatabase, shared, "node-c", redis.Configuration, "opslvp-split")));
            await using var fourth = await start(new("node-d", PostgresSettings(splitDatabase, shared, "node-d", redis.Configuration, "opslvp-split")));
            await using var bare = await start(new("bare", null));

            await WaitAsync(async () => await pgOne.StatusAsync() is { IsLeader: true, EngineRestored: true }, "the one PostgreSQL node to lead and restore");
            await WaitAsync(async () => (await first.StatusAsync()).IsLeader != (await second.StatusAsync()).IsLeader, "exactly one of the two nodes to lead");
            await WaitAsync(async () => (await third.StatusAsync()).IsLeader != (await fourth.StatusAsync()).IsLeader, "exactly one of the split pair to lead");
            var (leader, standby) = (await first.StatusAsync()).IsLeader ? (first, second) : (second, first);
            var (splitLeader, splitStandby) = (await third.StatusAsync()).IsLeader ? (third, fourth) : (fourth, third);
            await WaitAsync(async () => (await leader.StatusAsync()).EngineRestored && (await splitLeader.StatusAsync()).EngineRestored, "the leaders to restore their engines");
            var leaderName = (await leader.StatusAsync()).NodeId;
            var standbyName = (await standby.StatusAsync()).NodeId;
            var splitLeaderName = (await splitLeader.StatusAsync()).NodeId;
            var splitStandbyName = (await splitStandby.StatusAsync()).NodeId;

            var sqliteKey = await sqlite.IssuePushKeyAsync();
            var pgKey = await pgOne.IssuePushKeyAsync();
            var haKey = await leader.IssuePushKeyAsync();
            var splitKey = await splitLeader.IssuePushKeyAsync();
            using var http = new HttpClient { Timeout = TimeSpan.FromSeconds(20) };
            var value = 1500;
            Func<Task> PostTo(IPushNode target, string key) => async () =>
            {
                value = PushLatencyHarness.NextValue(value);
                var body = new { readings = new[] { new { time = TimeProvider.System.GetUtcNow().ToString("O", CultureInfo.InvariantCulture), sensor = PushLatencyHarness.Sensor, kind = "rvr", value, status = "ok" } } };
                using var request = new HttpRequestMessage(HttpMethod.Post, new Uri(target.BaseAddress, "/api/readings")) { Content = JsonContent.Create(body) };
                request.Headers.Add(ApiKeyAuthenticationHandler.Header, key);
                using var response = await http.SendAsync(request);
                response.EnsureSuccessStatusCode();
            };
            string? Marker() => string.Create(CultureInfo.InvariantCulture, $":{PushLatencyHarness.NextValue(value)}");
            static List<(string, Uri)> On(int n, params (string Group, IPushNode Server)[] nodes) =>
                Enumerable.Range(0, n).Select(i => (nodes[i % nodes.Length].Group, new Uri(nodes[i % nodes.Length].Server.BaseAddress, "/hubs/lvp"))).ToList();
            var bareHubs = Enumerable.Range(0, counts.Max()).Select(_ => ("bare", new Uri(bare.BaseAddress, "/hubs/bare"))).ToList();

            // one unmeasured round on SQLite gives the state's size, the bare hub's payload
            var payloadChars = (await PushLatencyHarness.MeasureGroupsAsync(On(1, ("sqlite", sqlite)), sqliteKey, 1, Marker, PostTo(sqlite, sqliteKey))).PayloadChars;
            var duplicates = new List<string>();
            var answers = new List<string>();
            foreach (var n in counts)
            {
                Progress($"{n} clients");
                await bare.SetBarePayloadAsync(payloadChars > 0 ? payloadChars : 4096);
                List<PushLatencyHarness.Setup> setups =
                [
                    new("bare", bareHubs.Take(n).ToList(), null, () => null, async () =>
                    {
                        using var response = await http.PostAsync(new Uri(bare.BaseAddress, "/bare"), null);
                        response.EnsureSuccessStatusCode();
                    }),
                    new("sqlite", On(n, ("sqlite", sqlite)), sqliteKey, Marker, PostTo(sqlite, sqliteKey)),
                    new("pg", On(n, ("pg", pgOne)), pgKey, Marker, PostTo(pgOne, pgKey)),
                    new("standby", On(n, ("standby", standby)), haKey, Marker, PostTo(leader, haKey)),
                ];
                if (n >= 2)
                {
                    setups.Add(new("split", On(n, ("leader", splitLeader), ("standby", splitStandby)), splitKey, Marker, PostTo(splitLeader, splitKey)));
                }
                var measured = await PushLatencyHarness.MeasureInterleavedAsync(setups, rounds, host);
                var (bareRun, one, pg, allOnStandby) = (measured[0], measured[1], measured[2], measured[3]);
                var split = n >= 2 ? measured[4] : null;
                payloadChars = Math.Max(payloadChars, measured.Skip(1).Max(m => m.PayloadChars));

                var bareP99 = bareRun.ByGroup["bare"].P99;
                var budget = bareP99 + commit + 5;
                var pgP99 = pg.ByGroup["pg"].P99;
                var target = pgP99 + TargetSlackMs;
                string Verdict(Latencies l, bool twoNodes) => string.Create(CultureInfo.InvariantCulture,
                    $"budget {(l.P99 <= budget ? "met" : "MISSED")}: p99 ≤ bare p99 + commit + 5 ms = {budget:0.00} ms ({(l.P99 <= budget ? "spare" : "over by")} {Math.Abs(budget - l.P99):0.00} ms)")
                    + (twoNodes ? string.Create(CultureInfo.InvariantCulture,
                        $"; issue target {(l.P99 <= target ? "met" : "MISSED")}: p99 ≤ one-node PostgreSQL p99 + {TargetSlackMs:0} ms = {target:0.00} ms ({(l.P99 <= target ? "spare" : "over by")} {Math.Abs(target - l.P99):0.00} ms)") : "");
                void Row(string what, Latencies l, double reference, string referenceName, bool twoNodes) =>
                    book.Add(new ResultRow(section, $"{what}, {n} clients: {l}", Ms(l.P99), l.P99 / reference, referenceName, null, Verdict(l, twoNodes), command));

                book.Add(new ResultRow(section, $"bare hub, {n} clients: {bareRun.ByGroup["bare"]}", Ms(bareP99), null, null, null, null, command));
                var sqliteP99 = one.ByGroup["sqlite"].P99;
                Row("one node, SQLite", one.ByGroup["sqlite"], bareP99, "bare p99", false);
                Row("one node, PostgreSQL", pg.ByGroup["pg"], sqliteP99, "SQLite one-node p99", false);
                Row($"two nodes, all clients on the standby ({standbyName})", allOnStandby.ByGroup["standby"], pgP99, "PostgreSQL one-node p99", true);
                if (split is not null)
                {
                    Row($"two nodes, split: the {n / 2 + n % 2} on the leader ({splitLeaderName})", split.ByGroup["leader"], pgP99, "PostgreSQL one-node p99", true);
                    Row($"two nodes, split: the {n / 2} on the standby ({splitStandbyName})", split.ByGroup["standby"], pgP99, "PostgreSQL one-node p99", true);
                }
                static string Answer(Latencies l) => string.Create(CultureInfo.InvariantCulture, $"{l.P50:0.00} / {l.P99:0.00}");
                answers.Add(string.Create(CultureInfo.InvariantCulture,
                    $"{n} clients: bare {Answer(bareRun.Answered)}, one node SQLite {Answer(one.Answered)}, PostgreSQL {Answer(pg.Answered)}, two nodes (all on standby) {Answer(allOnStandby.Answered)}{(split is null ? "" : $", split {Answer(split.Answered)}")}"));
                duplicates.Add(string.Create(CultureInfo.InvariantCulture,
                    $"{n} clients: one node SQLite {one.DeliveriesPerRound:0.00}, PostgreSQL {pg.DeliveriesPerRound:0.00}, all on standby {allOnStandby.DeliveriesPerRound:0.00}{(split is null ? "" : $", split {split.DeliveriesPerRound:0.00}")}"));
            }
            var nodesWhere = options.NodesInProcess ? "all nodes in the benchmark's process (--nodes-in-process)"
                : "each node (bare hub, one node SQLite, one node PostgreSQL, node-a to node-d) in a process of its own (--role node)";
            var clientsWhere = host == ClientHost.OwnProcess
                ? "the hub clients in a process of their own (--role clients; latency from one clock: Stopwatch timestamps, CLOCK_MONOTONIC, checked at its start)"
                : "the hub clients in the benchmark's process (--clients-in-process)";
            book.Note(string.Create(CultureInfo.InvariantCulture,
                $"push-ha: {rounds} rounds per client count and configuration, the configurations in turn (order rotated each round), 150 ms apart, all connected at once; state payload up to {payloadChars} characters; all on the standby: leader {leaderName}, standby {standbyName}; split: leader {splitLeaderName}, standby {splitStandbyName} (second pair, Redis prefix opslvp-split); Live:MaxStatesPerSecond={Rate} on every node; Npgsql pool {poolSize} per {(options.NodesInProcess ? "database" : "node")}; one PostgreSQL cluster (max_connections 100) and one redis-server on loopback, {nodesWhere}, {clientsWhere}; the benchmark's process posts the readings and takes t0."));
            book.Note("push-ha: the POST's own time, sent → answered, p50 / p99 ms (a reading's 202 comes after its evaluation is committed and published, docs/feeds.md; the bare hub's after its broadcast is issued): " + string.Join("; ", answers) + ".");
            book.Note("push-ha: state messages of the awaited snapshot version received per client per round (1.00 = each snapshot once): " + string.Join("; ", duplicates) + ".");
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            NpgsqlConnection.ClearAllPools();
            BenchFiles.TryDeleteFolder(shared);
        }
    }

    /// <summary>A node on PostgreSQL <paramref name="connectionString"/>; with <paramref name="redis"/>, in the cluster (one anchor key per Redis prefix, each node its own anchor log).</summary>
    private static Dictionary<string, string?> PostgresSettings(string connectionString, string shared, string node, string? redis, string? redisPrefix = null) =>
        HarnessSupport.PostgresNode(connectionString, shared, node, redis is null ? node + "-anchor-key.pem" : (redisPrefix ?? "opslvp") + "-anchor-key.pem",
            redis, redisPrefix, new Dictionary<string, string?> { [RateSetting] = Rate });

    private static Task WaitAsync(Func<Task<bool>> condition, string what) => HarnessSupport.WaitAsync(Suite, condition, what);

    private static void Progress(string what) => HarnessSupport.Progress(Suite, what);

    private static string Ms(double ms) => HarnessSupport.Ms(ms);
}
