using System.Diagnostics;
using System.Globalization;
using System.Net.Http.Json;
using System.Text.Json;
using OpsLvp.Benchmarks.Reporting;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// Reading accepted → <c>state</c> received, per SignalR .NET client on <c>/hubs/lvp</c> of the real server
/// (in-process Kestrel on 127.0.0.1), beside a bare hub broadcasting a payload of the same size to the same number
/// of clients in the same run. t0 is taken just before POST /api/readings (or POST /bare) is sent, so both sides
/// include the HTTP request. Bounded: fixed rounds, 10 s timeout per round, loopback only.
/// </summary>
public static class PushLatencyHarness
{
    /// <summary>An RVR system sensor of the demo profile (reports RVR directly) at 07R end, a governing position.</summary>
    public const string Sensor = "rvr-07r-end";

    private static readonly TimeSpan RoundTimeout = TimeSpan.FromSeconds(10);

    public static async Task RunAsync(BenchOptions options, ResultsBook book, string command)
    {
        int[] counts = options.Quick ? [1, 20, 50] : [1, 100, 500];
        var rounds = options.Quick ? 5 : 20;
        const string section = "Live push latency (reading posted → state received, per client)";
        var commit = await MeasureAuditCommitAsync(options.Quick ? 10 : 30);
        book.Add(new ResultRow(section, "one audit commit (AuditStore.AppendAsync, 1 entry + engine state, FULL; median)", Ms(commit), null, null, null, null, command));

        await using var server = BenchServer.Start();
        await using var bare = await BareServer.StartAsync();
        var key = await server.IssuePushKeyAsync();
        using var http = new HttpClient { Timeout = TimeSpan.FromSeconds(20) };
        var payloadChars = 0;
        var value = 1500;
        foreach (var n in counts)
        {
            Latencies? ours = null;
            string? failure = null;
            try
            {
                (ours, payloadChars) = await MeasureAsync(new Uri(server.BaseAddress, "/hubs/lvp"), key, n, rounds, () => string.Create(CultureInfo.InvariantCulture, $":{NextValue(value)}"), async () =>
                {
                    value = NextValue(value);
                    var body = new { readings = new[] { new { time = TimeProvider.System.GetUtcNow().ToString("O", CultureInfo.InvariantCulture), sensor = Sensor, kind = "rvr", value, status = "ok" } } };
                    using var request = new HttpRequestMessage(HttpMethod.Post, new Uri(server.BaseAddress, "/api/readings")) { Content = JsonContent.Create(body) };
                    request.Headers.Add(ApiKeyAuthenticationHandler.Header, key);
                    using var response = await http.SendAsync(request);
                    response.EnsureSuccessStatusCode();
                });
            }
            catch (Exception ex) when (ex is HttpRequestException or TimeoutException or InvalidOperationException)
            {
                failure = ex.Message.ReplaceLineEndings(" ");
            }
            BareServer.PayloadChars = payloadChars > 0 ? payloadChars : 4096;
            var (bareLatencies, _) = await MeasureAsync(new Uri(bare.BaseAddress, "/hubs/bare"), null, n, rounds, () => null, async () =>
            {
                using var response = await http.PostAsync(new Uri(bare.BaseAddress, "/bare"), null);
                response.EnsureSuccessStatusCode();
            });
            if (ours is null)
            {
                book.Add(new ResultRow(section, $"ours, {n} clients", "not measured", null, null, null, $"/hubs/lvp or POST /api/readings failed on this build: {failure}", command));
            }
            else
            {
                var budget = bareLatencies.P99 + commit + 5;
                book.Add(new ResultRow(section, $"ours, {n} clients: {ours}", Ms(ours.P99), ours.P99 / bareLatencies.P99, "bare p99", null,
                    n == counts[^1] ? $"{(ours.P99 <= budget ? "met" : "MISSED")}: p99 ≤ bare p99 + commit + 5 ms = {budget:0.00} ms" : null, command));
            }
            book.Add(new ResultRow(section, $"bare hub, {n} clients: {bareLatencies}", Ms(bareLatencies.P99), null, null, null, null, command));
            if (ours is not null)
            {
                book.Add(new ResultRow(section, $"ours − bare, {n} clients (p50 / p99 / max)",
                    string.Create(CultureInfo.InvariantCulture, $"{ours.P50 - bareLatencies.P50:0.00} / {ours.P99 - bareLatencies.P99:0.00} / {ours.Max - bareLatencies.Max:0.00} ms"), null, null, null, null, command));
            }
        }
        book.Note(string.Create(CultureInfo.InvariantCulture, $"Push latency: {rounds} rounds per client count, state payload {payloadChars} characters (bare payload {BareServer.PayloadChars}), clients and server in one process on loopback."));
    }

    /// <summary>Connects <paramref name="n"/> clients, runs <paramref name="rounds"/> posts and returns every client's latency of every round.</summary>
    /// <param name="marker">Text the awaited message must contain (the posted value), so a heartbeat snapshot is not taken for the answer; null: any message.</param>
    /// <param name="key">API key sent as <see cref="ApiKeyAuthenticationHandler.Header"/> on the hub connection; null: none (bare hub).</param>
    private static async Task<(Latencies Latencies, int PayloadChars)> MeasureAsync(Uri hub, string? key, int n, int rounds, Func<string?> marker, Func<Task> post)
    {
        var measured = await MeasureGroupsAsync(Enumerable.Repeat(("all", hub), n).ToList(), key, rounds, marker, post);
        return (measured.ByGroup["all"], measured.PayloadChars);
    }

    /// <summary>
    /// One client per entry of <paramref name="placement"/> (a group name and the hub it connects to), runs
    /// <paramref name="rounds"/> posts and returns the latencies of every round per group, the largest payload seen,
    /// and how many <c>state</c> messages of the awaited version each client received per round on average (1 unless
    /// the same snapshot reaches a client more than once).
    /// </summary>
    internal static async Task<(IReadOnlyDictionary<string, Latencies> ByGroup, int PayloadChars, double DeliveriesPerRound)> MeasureGroupsAsync(
        IReadOnlyList<(string Group, Uri Hub)> placement, string? key, int rounds, Func<string?> marker, Func<Task> post)
    {
        var measured = await MeasureInterleavedAsync([new Setup("only", placement, key, marker, post)], rounds);
        return (measured[0].ByGroup, measured[0].PayloadChars, measured[0].DeliveriesPerRound);
    }

    /// <summary>
    /// A configuration measured by <see cref="MeasureInterleavedAsync"/>: its clients (group name and hub of each),
    /// the API key they connect with (null: none), the text the awaited <c>state</c> must contain and the post that
    /// makes it.
    /// </summary>
    internal sealed record Setup(string Name, IReadOnlyList<(string Group, Uri Hub)> Placement, string? Key, Func<string?> Marker, Func<Task> Post);

    /// <summary>What <see cref="MeasureInterleavedAsync"/> measured for one <see cref="Setup"/>.</summary>
    /// <param name="Answered">Per round, the post's own time (sent → answered): for a reading, its 202, which comes after the
    /// evaluation is committed and published (docs/feeds.md), so the rest of a client's latency is the delivery.</param>
    internal sealed record Measured(IReadOnlyDictionary<string, Latencies> ByGroup, int PayloadChars, double DeliveriesPerRound, Latencies Answered);

    /// <summary>
    /// Connects the clients of every setup at once, then runs <paramref name="rounds"/> rounds in which each setup
    /// posts once and waits for all its clients, 150 ms apart, the order of the setups rotated by one each round:
    /// load that drifts during the run hits every setup alike. Per setup: latencies per group, largest payload and
    /// <c>state</c> messages of the awaited version per client per round. The clients run where <paramref name="host"/>
    /// says; the posts are made from this process either way.
    /// </summary>
    internal static async Task<IReadOnlyList<Measured>> MeasureInterleavedAsync(IReadOnlyList<Setup> setups, int rounds, ClientHost host = ClientHost.InProcess)
    {
        await using IProbes probes = host == ClientHost.OwnProcess ? await ProbeProcess.StartAsync() : new LocalProbes();
        await probes.ConnectAsync([.. setups.Select(s => new ProbeSetup(s.Key, [.. s.Placement.Select(p => p.Hub)]))]);
        var samples = setups.Select(s => s.Placement.Select(p => p.Group).Distinct().ToDictionary(g => g, _ => new List<double>(s.Placement.Count * rounds))).ToList();
        var answered = setups.Select(_ => new List<double>(rounds)).ToList();
        var deliveries = new long[setups.Count];
        var measuredBefore = new bool[setups.Count];
        // One unmeasured round (-1) warms up every path.
        for (var round = -1; round < rounds; round++)
        {
            for (var k = 0; k < setups.Count; k++)
            {
                var i = (k + Math.Max(round, 0)) % setups.Count;
                var setup = setups[i];
                await Task.Delay(150);
                var previous = await probes.ArmAsync(i, setup.Marker());
                if (measuredBefore[i])
                {
                    deliveries[i] += previous;
                }
                // the clients' receipt timestamps are Stopwatch timestamps too, from their process if it is another (ProbeProcess: one clock)
                var t0 = Stopwatch.GetTimestamp();
                await setup.Post();
                var answeredAt = Stopwatch.GetTimestamp();
                long[] received;
                try
                {
                    received = await probes.WaitAsync(i, RoundTimeout);
                }
                catch (TimeoutException ex)
                {
                    throw new TimeoutException($"{setup.Name}: {ex.Message}", ex);
                }
                if (round >= 0)
                {
                    measuredBefore[i] = true;
                    answered[i].Add(Stopwatch.GetElapsedTime(t0, answeredAt).TotalMilliseconds);
                    for (var j = 0; j < received.Length; j++)
                    {
                        samples[i][setup.Placement[j].Group].Add(Stopwatch.GetElapsedTime(t0, received[j]).TotalMilliseconds);
                    }
                }
            }
        }
        await Task.Delay(150);
        var measured = new List<Measured>(setups.Count);
        for (var i = 0; i < setups.Count; i++)
        {
            var (last, payloadChars) = await probes.CountAsync(i);
            deliveries[i] += last;
            var clients = setups[i].Placement.Count;
            measured.Add(new Measured(
                samples[i].ToDictionary(g => g.Key, g => new Latencies(g.Value)),
                payloadChars,
                rounds == 0 || clients == 0 ? 0 : deliveries[i] / (double)(rounds * clients),
                new Latencies(answered[i])));
        }
        return measured;
    }

    /// <summary>The median of <paramref name="appends"/> audit commits on a fresh SQLite file (FULL), the "one audit commit" of the push target.</summary>
    internal static Task<double> MeasureSqliteAuditCommitAsync(int appends) => MeasureAuditCommitAsync(appends);

    private static async Task<double> MeasureAuditCommitAsync(int appends)
    {
        var folder = Path.Combine(Path.GetTempPath(), "opslvp-bench", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(folder);
        try
        {
            var factory = new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions($"Data Source={Path.Combine(folder, "commit.db")}"));
            await DatabaseStartup.MigrateAndCheckAsync(factory);
            using var store = new AuditStore(factory);
            var state = JsonSerializer.Serialize(new { phase = "normal", note = new string('s', 4000) });
            var times = new List<double>(appends);
            var at = new DateTimeOffset(2026, 1, 15, 0, 0, 0, TimeSpan.Zero);
            for (var i = -3; i < appends; i++)
            {
                var start = Stopwatch.GetTimestamp();
                await store.AppendAsync([new NewAuditEntry("system", "reading_applied", Audit.AuditAppendBenchmarks.Payload, at.AddSeconds(i + 3))], new EngineStateWrite(state, "bench", at));
                if (i >= 0)
                {
                    times.Add(Stopwatch.GetElapsedTime(start).TotalMilliseconds);
                }
            }
            return new Latencies(times).P50;
        }
        finally
        {
            Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
            BenchFiles.TryDeleteFolder(folder);
        }
    }

    /// <summary>1500, 1510, … 1890, 1500, …: above the preparation threshold (phase stays normal), never twice in a row.</summary>
    internal static int NextValue(int value) => value >= 1890 ? 1500 : value + 10;

    private static string Ms(double ms) => string.Create(CultureInfo.InvariantCulture, $"{ms:0.00} ms");
}
