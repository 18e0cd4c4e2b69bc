using System.Collections.Concurrent;
using System.Diagnostics;
using System.Globalization;
using System.Net;
using System.Net.Http.Json;
using Microsoft.Extensions.DependencyInjection;
using Npgsql;
using OpsLvp.Benchmarks.Reporting;
using OpsLvp.Benchmarks.Services;
using OpsLvp.Web.Access;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// Issue 16, the reading inbox's throughput (docs/engine.md R73–R75): two nodes on one database of a throwaway
/// PostgreSQL cluster (<see cref="BenchPostgres"/>; real <see cref="PostgresLeadership"/> election, no Redis: the inbox
/// does not use it), in-process Kestrel (<see cref="BenchServer"/>). <see cref="Senders"/> concurrent senders push N
/// batches of k readings to the standby as fast as its answers let them; then the same to the leader directly. Per
/// path: batches/s and readings/s answered 202, batches/s stored by the leader (the last batch seen in the readings
/// table), and per batch the time from sending to its 202 and to its readings in the leader's store (seen by polling
/// the readings table every <see cref="PollEvery"/>, so that figure is late by up to one poll).
/// </summary>
public static class InboxHarness
{
    /// <summary>Concurrent senders (each waits for its answer before sending the next batch).</summary>
    public const int Senders = 8;

    /// <summary>How often the bench looks into the readings table for the batches' readings.</summary>
    public static readonly TimeSpan PollEvery = TimeSpan.FromMilliseconds(10);

    /// <summary>The demo profile's sensors that report RVR itself (kind <c>rvr</c>).</summary>
    private static readonly string[] s_sensors = ["rvr-07r-end", "rvr-16-tdz", "rvr-16-mid", "rvr-16-end"];

    private const int PoolSize = 40;

    private const string Suite = "inbox";

    /// <summary>The paced runs' interval between batches (20 a second).</summary>
    public static readonly TimeSpan PacedEvery = TimeSpan.FromMilliseconds(50);

    public static async Task RunAsync(BenchOptions options, ResultsBook book, string command)
    {
        var batches = options.Quick ? 200 : 2000;
        const int readingsPerBatch = 8;
        const string section = "Reading inbox throughput (two nodes on PostgreSQL: pushed to the standby, drained by the leader; against pushing to the leader)";
        if (BenchPostgres.FindBin() is null)
        {
            book.Note("inbox: not measured on this run: PostgreSQL server programs not found (apt install postgresql, or set OPSLVP_PG_BIN).");
            return;
        }
        var shared = Path.Combine(Path.GetTempPath(), "opslvp-bench-inbox", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(shared);
        try
        {
            var database = new NpgsqlConnectionStringBuilder(BenchPostgres.Shared.CreateDatabase()) { MaxPoolSize = PoolSize }.ConnectionString;
            await using var first = BenchServer.Start(Settings(database, shared, "node-a"));
            await using var second = BenchServer.Start(Settings(database, shared, "node-b"));
            await WaitAsync(() => first.Services.GetRequiredService<ILeadership>().IsLeader != second.Services.GetRequiredService<ILeadership>().IsLeader,
                "exactly one of the two nodes to lead");
            var (leader, standby) = first.Services.GetRequiredService<ILeadership>().IsLeader ? (first, second) : (second, first);
            await WaitAsync(() => leader.Services.GetRequiredService<LiveEngineHost>().State is not null, "the leader to restore its engine");
            var key = await leader.IssuePushKeyAsync();

            Progress($"{batches} batches of {readingsPerBatch} readings to the standby");
            var viaStandby = await MeasureAsync(standby, key, database, batches, readingsPerBatch, firstMarker: 2000);
            Progress($"{batches} batches of {readingsPerBatch} readings to the leader");
            var direct = await MeasureAsync(leader, key, database, batches, readingsPerBatch, firstMarker: 6000);
            // the hop itself, without a queue: one sender, one batch every PacedEvery (well under either path's rate)
            var paced = options.Quick ? 50 : 200;
            Progress($"{paced} batches, one every {PacedEvery.TotalMilliseconds:0} ms, to the standby and to the leader");
            var pacedStandby = await MeasureAsync(standby, key, database, paced, readingsPerBatch, firstMarker: 9000, senders: 1, pace: PacedEvery);
            var pacedDirect = await MeasureAsync(leader, key, database, paced, readingsPerBatch, firstMarker: 9500, senders: 1, pace: PacedEvery);

            foreach (var (path, m) in new[] { ("to the standby, through the inbox", viaStandby), ("to the leader directly", direct) })
            {
                book.Add(new ResultRow(section, $"{path}: answered 202, batches/s ({m.Batches} batches, {Senders} senders)", Rate(m.Batches, m.AnsweredSeconds), null, null, null, "no target set", command));
                book.Add(new ResultRow(section, $"{path}: answered 202, readings/s ({m.Batches * readingsPerBatch} readings)", Rate(m.Batches * readingsPerBatch, m.AnsweredSeconds), null, null, null, null, command));
                book.Add(new ResultRow(section, $"{path}: stored by the leader, batches/s (first send to last batch in the readings table)", Rate(m.Batches, m.StoredSeconds), null, null, null, null, command));
                book.Add(new ResultRow(section, $"{path}: stored by the leader, readings/s", Rate(m.Batches * readingsPerBatch, m.StoredSeconds), null, null, null, null, command));
                book.Add(new ResultRow(section, $"{path}: stored by the leader, batches/s between the first and the last batch seen stored", Rate(m.Batches - 1, m.StoringSeconds), null, null, null, null, command));
                book.Add(new ResultRow(section, $"{path}: send → 202, per batch: {m.Answered}", Ms(m.Answered.P99), null, null, null, null, command));
                book.Add(new ResultRow(section, $"{path}: send → in the leader's store, per batch: {m.Stored}", Ms(m.Stored.P99), null, null, null, null, command));
                if (m.AnswerToStored is { } wait)
                {
                    book.Add(new ResultRow(section, $"{path}: 202 → in the leader's store, per batch: {wait}", Ms(wait.P99), null, null, null, null, command));
                }
            }
            foreach (var (path, m) in new[] { ("paced, to the standby", pacedStandby), ("paced, to the leader directly", pacedDirect) })
            {
                book.Add(new ResultRow(section, $"{path}: send → 202, per batch: {m.Answered}", Ms(m.Answered.P99), null, null, null, null, command));
                book.Add(new ResultRow(section, $"{path}: send → in the leader's store, per batch: {m.Stored}", Ms(m.Stored.P99), null, null, null, null, command));
                if (m.AnswerToStored is { } wait)
                {
                    book.Add(new ResultRow(section, $"{path}: 202 → in the leader's store, per batch: {wait}", Ms(wait.P99), null, null, null, null, command));
                }
            }
            book.Note(string.Create(CultureInfo.InvariantCulture,
                $"inbox: {batches} batches of {readingsPerBatch} readings (the demo profile's 4 RVR-reporting sensors, invented values) per path, {Senders} concurrent senders; leader {leader.Services.GetRequiredService<ILeadership>().NodeId}, standby {standby.Services.GetRequiredService<ILeadership>().NodeId}; Cluster:InboxPollInterval default (2 s; the NOTIFY wakes the leader first); readings table polled every {PollEvery.TotalMilliseconds:0} ms (store times late by up to that); paced rows: {paced} batches, one sender, one batch every {PacedEvery.TotalMilliseconds:0} ms; non-2xx answers: standby {viaStandby.Failures + pacedStandby.Failures}, leader {direct.Failures + pacedDirect.Failures}; one PostgreSQL cluster on loopback, both nodes and the senders in one process."));
        }
        finally
        {
            NpgsqlConnection.ClearAllPools();
            BenchFiles.TryDeleteFolder(shared);
        }
    }

    private sealed record Measurement(int Batches, double AnsweredSeconds, double StoredSeconds, double StoringSeconds, Latencies Answered, Latencies Stored, Latencies? AnswerToStored, int Failures);

    private static async Task<Measurement> MeasureAsync(BenchServer target, string key, string database, int batches, int readingsPerBatch, int firstMarker, int senders = Senders, TimeSpan? pace = null)
    {
        using var http = new HttpClient(new SocketsHttpHandler { MaxConnectionsPerServer = senders }) { Timeout = TimeSpan.FromSeconds(60) };
        var clock = Stopwatch.StartNew();
        var sent = new double[batches];
        var answered = new double[batches];
        var stored = new ConcurrentDictionary<int, double>();
        long startId;
        await using (var connection = new NpgsqlConnection(database))
        {
            await connection.OpenAsync();
            await using var max = new NpgsqlCommand("SELECT coalesce(max(id), 0) FROM readings", connection);
            startId = (long)(await max.ExecuteScalarAsync())!;
        }
        using var stop = new CancellationTokenSource();
        var watcher = WatchAsync(database, startId, firstMarker, batches, clock, stored, stop.Token);
        var next = -1;
        var failures = 0;
        var start = clock.Elapsed.TotalMilliseconds;
        async Task SendAsync()
        {
            int i;
            while ((i = Interlocked.Increment(ref next)) < batches)
            {
                var marker = firstMarker + i;
                var at = TimeProvider.System.GetUtcNow().AddSeconds(-1);
                var body = new
                {
                    readings = Enumerable.Range(0, readingsPerBatch).Select(j => new
                    {
                        time = at.AddMilliseconds(j / s_sensors.Length).ToString("O", CultureInfo.InvariantCulture),
                        sensor = s_sensors[j % s_sensors.Length],
                        kind = "rvr",
                        value = marker,
                        status = "ok",
                    }).ToArray(),
                };
                while (true)
                {
                    sent[i] = clock.Elapsed.TotalMilliseconds;
                    using var request = new HttpRequestMessage(HttpMethod.Post, new Uri(target.BaseAddress, "/api/readings")) { Content = JsonContent.Create(body) };
                    request.Headers.Add(ApiKeyAuthenticationHandler.Header, key);
                    using var response = await http.SendAsync(request);
                    if (response.StatusCode == HttpStatusCode.Accepted)
                    {
                        answered[i] = clock.Elapsed.TotalMilliseconds;
                        break;
                    }
                    // a feed sends again after a 503 (an inbox full, a store not confirmed): so does the bench, and counts it
                    Interlocked.Increment(ref failures);
                    await Task.Delay(TimeSpan.FromMilliseconds(200));
                }
                if (pace is { } every)
                {
                    await Task.Delay(every);
                }
            }
        }
        await Task.WhenAll(Enumerable.Range(0, senders).Select(_ => Task.Run(SendAsync)));
        var lastAnswer = answered.Max();
        var deadline = clock.Elapsed + TimeSpan.FromMinutes(5);
        while (stored.Count < batches)
        {
            if (clock.Elapsed > deadline)
            {
                throw new TimeoutException($"inbox: {batches - stored.Count} of {batches} batches not in the readings table 5 minutes after the last 202");
            }
            await Task.Delay(50);
        }
        await stop.CancelAsync();
        await watcher;
        var storedAt = Enumerable.Range(0, batches).Select(i => stored[i]).ToArray();
        var toStore = Enumerable.Range(0, batches).Select(i => storedAt[i] - sent[i]).ToList();
        var answerToStore = Enumerable.Range(0, batches).Select(i => Math.Max(0, storedAt[i] - answered[i])).ToList();
        return new Measurement(
            batches,
            (lastAnswer - start) / 1000,
            (storedAt.Max() - start) / 1000,
            (storedAt.Max() - storedAt.Min()) / 1000,
            new Latencies(Enumerable.Range(0, batches).Select(i => answered[i] - sent[i]).ToList()),
            new Latencies(toStore),
            target.Services.GetRequiredService<ILeadership>().IsLeader ? null : new Latencies(answerToStore),
            failures);
    }

    /// <summary>Polls the readings table for the markers (the value every reading of batch i carries) and notes when each batch first appears.</summary>
    private static async Task WatchAsync(string database, long afterId, int firstMarker, int batches, Stopwatch clock, ConcurrentDictionary<int, double> stored, CancellationToken stop)
    {
        await using var connection = new NpgsqlConnection(database);
        await connection.OpenAsync(CancellationToken.None);
        await using var command = new NpgsqlCommand("SELECT id, value FROM readings WHERE id > $1 ORDER BY id", connection);
        var after = new NpgsqlParameter { NpgsqlDbType = NpgsqlTypes.NpgsqlDbType.Bigint, Value = afterId };
        command.Parameters.Add(after);
        await command.PrepareAsync(CancellationToken.None);
        while (!stop.IsCancellationRequested)
        {
            await using (var reader = await command.ExecuteReaderAsync(CancellationToken.None))
            {
                var seen = clock.Elapsed.TotalMilliseconds;
                while (await reader.ReadAsync(CancellationToken.None))
                {
                    after.Value = reader.GetInt64(0);
                    if (!reader.IsDBNull(1))
                    {
                        var batch = (int)Math.Round(reader.GetDouble(1)) - firstMarker;
                        if (batch >= 0 && batch < batches)
                        {
                            stored.TryAdd(batch, seen);
                        }
                    }
                }
            }
            try
            {
                await Task.Delay(PollEvery, stop);
            }
            catch (OperationCanceledException)
            {
                return;
            }
        }
    }

    private static string Rate(int count, double seconds) => string.Create(CultureInfo.InvariantCulture, $"{count / seconds:0} /s");

    private static string Ms(double ms) => HarnessSupport.Ms(ms);

    private static Task WaitAsync(Func<bool> condition, string what) => HarnessSupport.WaitAsync(Suite, condition, what);

    private static void Progress(string what) => HarnessSupport.Progress(Suite, what);

    /// <summary>A node of the pair: no Redis (the inbox does not use it), one anchor key for both.</summary>
    private static Dictionary<string, string?> Settings(string connectionString, string shared, string node) =>
        HarnessSupport.PostgresNode(connectionString, shared, node, "anchor-key.pem");
}
