using System.Diagnostics;
using System.Globalization;
using System.Net;
using System.Text.Json;

namespace OpsLvp.FaultCases;

/// <summary>
/// Failover of two real server processes on one PostgreSQL database (docs/engine.md R70–R72; docs/reliability.md
/// "Failover"): a stream of pushed readings goes to both nodes (the standby hands its readings over to the leader through
/// the reading inbox, docs/engine.md R73–R75), the engine ticks on the leader; the leader is killed with SIGKILL again and again. Each time the other node must take over
/// (takeover time: the kill to the first <c>/health</c> of the other node showing its engine running with an
/// evaluation after the kill), the inbox must drain, every reading answered 202 by either node must be stored, the chain must verify with no sequence written
/// twice, and the killed node restarts and joins as a standby. Rows of <see cref="Group"/> in the tally.
/// </summary>
public static class HaKillRun
{
    public const string Group = "failover (kill -9 of the leader)";

    /// <summary>Runs the kills; returns the acknowledged readings checked, how many were not stored, and each takeover time.</summary>
    public static async Task<(long Checked, long Lost, IReadOnlyList<TimeSpan> Takeovers)> RunAsync(
        int kills, string folder, string connectionString, int seed, FaultTally tally, Action<string> log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(tally);
        ArgumentNullException.ThrowIfNull(log);
        var random = new Random(seed);
        var profile = FaultProfile.Write(folder);
        var anchors = Directory.CreateDirectory(Path.Combine(folder, "anchors")).FullName;
        var pushes = new Pushes(DateTimeOffset.FromUnixTimeMilliseconds(DateTimeOffset.UtcNow.AddSeconds(-30).ToUnixTimeMilliseconds()));
        var runStart = DateTimeOffset.UtcNow.AddMinutes(-1);
        var heads = new List<(long, string)>();
        var takeovers = new List<TimeSpan>();
        long lost = 0;
        var nodes = new ServerProcess?[2];
        try
        {
            nodes[0] = await StartNodeAsync(folder, profile, anchors, connectionString, "node-0");
            nodes[1] = await StartNodeAsync(folder, profile, anchors, connectionString, "node-1");
            for (var kill = 0; kill < kills && !cancellationToken.IsCancellationRequested; kill++)
            {
                var leader = await LeaderAsync(nodes, TimeSpan.FromSeconds(60));
                if (leader < 0)
                {
                    tally.Broke(Group, "one node leads", $"kill {kill}: neither node runs the engine after 60 s");
                    break;
                }
                tally.Held(Group, "one node leads");
                var other = 1 - leader;
                using var stop = new CancellationTokenSource();
                var pushers = Enumerable.Range(0, 4).Select(p => Task.Run(async () =>
                {
                    var r = new Random(HashCode.Combine(seed, kill, p));
                    var node = nodes[p % 2]!;
                    while (!stop.IsCancellationRequested)
                    {
                        var status = await pushes.PushAsync(node.Client, r.Next(1, 21), CancellationToken.None);
                        if (status is null && node.HasExited)
                        {
                            break;
                        }
                        if (status != HttpStatusCode.Accepted)
                        {
                            // a node refusing (killed, not recording, just taking over): the feed retries later, not in a tight loop
                            await Task.Delay(100, CancellationToken.None);
                        }
                    }
                }, CancellationToken.None)).ToArray();
                await Task.Delay(random.Next(500, 3000), cancellationToken);
                var killedAt = DateTimeOffset.UtcNow;
                var clock = Stopwatch.StartNew();
                nodes[leader]!.Kill(); // SIGKILL while requests are in flight
                var took = await TakeoverAsync(nodes[other]!, killedAt, TimeSpan.FromSeconds(60));
                await stop.CancelAsync();
                await Task.WhenAll(pushers);
                if (took)
                {
                    takeovers.Add(clock.Elapsed);
                    tally.Held(Group, "the other node takes over");
                    log($"kill {kill + 1}/{kills}: node-{leader} killed, node-{other} took over in {clock.Elapsed.TotalSeconds.ToString("0.00", CultureInfo.InvariantCulture)} s");
                }
                else
                {
                    tally.Broke(Group, "the other node takes over", $"kill {kill}: node-{other} did not run the engine within 60 s: {string.Join(" | ", nodes[other]!.LastLines.TakeLast(5))}");
                }

                using (var facts = new PostgresStoredFacts(connectionString))
                {
                    // readings acknowledged by the standby are stored by the leader from the inbox: wait for it to drain
                    var drainDeadline = DateTime.UtcNow + TimeSpan.FromSeconds(60);
                    long waiting;
                    while ((waiting = await facts.InboxWaitingAsync()) > 0 && DateTime.UtcNow < drainDeadline)
                    {
                        await Task.Delay(100, CancellationToken.None);
                    }
                    if (waiting == 0)
                    {
                        tally.Held(Group, "inbox drained by the new leader");
                    }
                    else
                    {
                        tally.Broke(Group, "inbox drained by the new leader", $"kill {kill}: {waiting} batch(es) still in the reading inbox 60 s after the takeover");
                    }
                    var acknowledged = pushes.Acknowledged;
                    var missing = await facts.MissingAsync(acknowledged, runStart);
                    lost = missing.Count;
                    if (missing.Count == 0)
                    {
                        tally.Held(Group, "acknowledged readings stored");
                    }
                    else
                    {
                        tally.Broke(Group, "acknowledged readings stored", $"kill {kill}: {missing.Count} of {acknowledged.Count} acknowledged readings not stored, first {missing[0]:o}");
                    }
                    var twice = await facts.DuplicatesAsync(runStart);
                    if (twice == 0)
                    {
                        tally.Held(Group, "no reading stored twice");
                    }
                    else
                    {
                        tally.Broke(Group, "no reading stored twice", $"kill {kill}: {twice} reading times stored more than once");
                    }
                    var chain = await facts.CheckChainAsync(heads);
                    if (chain is null)
                    {
                        tally.Held(Group, "chain verifies, no sequence written twice");
                    }
                    else
                    {
                        tally.Broke(Group, "chain verifies, no sequence written twice", $"kill {kill}: {chain}");
                    }
                    if (await facts.HeadAsync() is { } head)
                    {
                        heads.Add((head.Sequence, head.Hash));
                    }
                }

                // the killed node comes back and joins as a standby
                nodes[leader]!.Dispose();
                nodes[leader] = null;
                nodes[leader] = await StartNodeAsync(folder, profile, anchors, connectionString, $"node-{leader}");
                if (await EngineRunningAsync(nodes[leader]!) is false)
                {
                    tally.Held(Group, "restarted node joins as standby");
                }
                else
                {
                    tally.Broke(Group, "restarted node joins as standby", $"kill {kill}: node-{leader} runs the engine after its restart while node-{other} leads");
                }
            }
        }
        finally
        {
            foreach (var node in nodes)
            {
                node?.Dispose();
            }
        }
        tally.Note("ha-readings", $"failover: {pushes.Acknowledged.Count:N0} acknowledged readings checked after {takeovers.Count} takeovers, {lost:N0} not stored");
        if (takeovers.Count > 0)
        {
            var sorted = takeovers.Order().ToList();
            tally.Note("ha-takeover", string.Create(CultureInfo.InvariantCulture,
                $"failover: takeover (kill to the new leader's first evaluation) median {sorted[sorted.Count / 2].TotalSeconds:0.00} s, max {sorted[^1].TotalSeconds:0.00} s over {sorted.Count} kills"));
        }
        return (pushes.Acknowledged.Count, lost, takeovers);
    }

    private static Task<ServerProcess> StartNodeAsync(string folder, string profile, string anchors, string connectionString, string node) =>
        ServerProcess.StartAsync(Directory.CreateDirectory(Path.Combine(folder, node)).FullName, profile, new Dictionary<string, string>
        {
            ["OpsLvp__Database__Provider"] = "Postgres",
            ["ConnectionStrings__OpsLvp"] = connectionString,
            ["Cluster__NodeId"] = node,
            ["Cluster__LeaderRetryInterval"] = "00:00:00.500",
            ["Anchors__KeyPath"] = Path.Combine(anchors, "anchor-key.pem"),
            ["Anchors__LogPath"] = Path.Combine(anchors, "anchors.jsonl"),
        });

    /// <summary>The index of the node whose engine runs, or -1 when none does within <paramref name="timeout"/>.</summary>
    private static async Task<int> LeaderAsync(ServerProcess?[] nodes, TimeSpan timeout)
    {
        var deadline = DateTime.UtcNow + timeout;
        while (DateTime.UtcNow < deadline)
        {
            for (var i = 0; i < nodes.Length; i++)
            {
                if (nodes[i] is { } node && await EngineRunningAsync(node) is true)
                {
                    return i;
                }
            }
            await Task.Delay(100);
        }
        return -1;
    }

    /// <summary>Waits until <paramref name="node"/>'s engine runs with an evaluation after <paramref name="killedAt"/>.</summary>
    private static async Task<bool> TakeoverAsync(ServerProcess node, DateTimeOffset killedAt, TimeSpan timeout)
    {
        var deadline = DateTime.UtcNow + timeout;
        while (DateTime.UtcNow < deadline)
        {
            if (await EngineAsync(node) is { } engine && engine.Running && engine.LastEvaluationAt > killedAt)
            {
                return true;
            }
            await Task.Delay(50);
        }
        return false;
    }

    private static async Task<bool?> EngineRunningAsync(ServerProcess node) => (await EngineAsync(node))?.Running;

    /// <summary>The engine part of the node's <c>/health</c>, or null when it does not answer.</summary>
    private static async Task<(bool Running, DateTimeOffset? LastEvaluationAt)?> EngineAsync(ServerProcess node)
    {
        try
        {
            using var response = await node.Client.GetAsync(new Uri("/health", UriKind.Relative));
            if (response.StatusCode != HttpStatusCode.OK)
            {
                return null;
            }
            using var health = JsonDocument.Parse(await response.Content.ReadAsStringAsync());
            var engine = health.RootElement.GetProperty("engine");
            var last = engine.TryGetProperty("lastEvaluationAt", out var at) && at.ValueKind == JsonValueKind.String ? at.GetDateTimeOffset() : (DateTimeOffset?)null;
            return (engine.GetProperty("running").GetBoolean(), last);
        }
        catch (Exception ex) when (ex is HttpRequestException or TaskCanceledException or JsonException or KeyNotFoundException)
        {
            return null;
        }
    }
}
