using System.Text.Json;

namespace OpsLvp.FaultCases;

/// <summary>
/// kill -9 of the real server under a stream of pushed readings and its own ticks, again and again on one data folder
/// (docs/reliability.md "Fault runs"). After every kill the file is checked: every reading answered 202 is stored, the
/// chain verifies with no gap, every head seen before is unchanged (no sequence reused); and every start after a kill
/// restores the saved state. Rows of <see cref="Group"/> in the tally.
/// </summary>
public static class KillRun
{
    public const string Group = "kill -9 under load";

    /// <summary>Runs the kills; returns how many acknowledged readings were checked after them and how many were not stored.</summary>
    public static async Task<(long Checked, long Lost)> RunAsync(int kills, string folder, int seed, FaultTally tally, Action<string> log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(tally);
        ArgumentNullException.ThrowIfNull(log);
        var random = new Random(seed);
        var profile = FaultProfile.Write(folder);
        var database = Path.Combine(folder, "opslvp.db");
        var pushes = new Pushes(DateTimeOffset.FromUnixTimeMilliseconds(DateTimeOffset.UtcNow.AddSeconds(-30).ToUnixTimeMilliseconds()));
        var heads = new List<(long, string)>();
        long checkedReadings = 0;
        long lost = 0;
        for (var kill = 0; kill < kills && !cancellationToken.IsCancellationRequested; kill++)
        {
            ServerProcess server;
            try
            {
                server = await ServerProcess.StartAsync(folder, profile);
            }
            catch (InvalidOperationException ex)
            {
                tally.Broke(Group, "restart after kill", ex.Message);
                log($"kill {kill}: restart failed, stopping the kill run: {ex.Message}");
                break;
            }
            var cycleStart = DateTimeOffset.UtcNow.AddMinutes(-1);
            var before = pushes.Acknowledged.Count;
            using (server)
            {
                pushes.SkipTo(DateTimeOffset.UtcNow.AddSeconds(-5));
                using var stop = new CancellationTokenSource();
                var pushers = Enumerable.Range(0, 3).Select(p => Task.Run(async () =>
                {
                    var r = new Random(HashCode.Combine(seed, kill, p));
                    while (!stop.IsCancellationRequested && await pushes.PushAsync(server.Client, r.Next(1, 51), CancellationToken.None) is not null)
                    {
                    }
                }, CancellationToken.None)).ToArray();
                await Task.Delay(random.Next(200, 3000), cancellationToken);
                server.Kill(); // SIGKILL while requests are in flight
                await stop.CancelAsync();
                await Task.WhenAll(pushers);
            }

            var acknowledged = pushes.Acknowledged.Skip(before).ToList();
            using var facts = new StoredFacts(database);
            var missing = await facts.MissingAsync(acknowledged, cycleStart);
            checkedReadings += acknowledged.Count;
            lost += missing.Count;
            if (missing.Count == 0)
            {
                tally.Held(Group, "acknowledged readings stored");
            }
            else
            {
                tally.Broke(Group, "acknowledged readings stored", $"kill {kill}: {missing.Count} of {acknowledged.Count} acknowledged readings not stored, first {missing[0]:o}");
            }

            var chain = await facts.CheckChainAsync(heads);
            if (chain is null)
            {
                tally.Held(Group, "chain verifies, no sequence reused");
            }
            else
            {
                tally.Broke(Group, "chain verifies, no sequence reused", $"kill {kill}: {chain}");
            }
            var head = await facts.HeadAsync();
            if (head is not null)
            {
                heads.Add((head.Sequence, head.Hash));
            }

            var starts = await facts.EntriesOfKindAsync("engine_started");
            if (kill > 0)
            {
                var restored = starts.Count > 0 && Restored(starts[^1].PayloadJson);
                if (restored)
                {
                    tally.Held(Group, "start after kill restores state");
                }
                else
                {
                    tally.Broke(Group, "start after kill restores state", $"kill {kill}: last engine_started is {(starts.Count == 0 ? "missing" : starts[^1].PayloadJson)}");
                }
            }
            if (kill % 10 == 9 || kill == kills - 1)
            {
                log($"kills {kill + 1}/{kills}: {checkedReadings:N0} acknowledged readings checked, {lost} lost, head {head?.Sequence}");
            }
        }
        tally.Note("kill-readings", $"kill -9: {checkedReadings:N0} acknowledged readings checked after the kills, {lost:N0} not stored");
        return (checkedReadings, lost);
    }

    private static bool Restored(string payloadJson)
    {
        using var payload = JsonDocument.Parse(payloadJson);
        return payload.RootElement.TryGetProperty("restored", out var restored) && restored.ValueKind == JsonValueKind.True;
    }
}
