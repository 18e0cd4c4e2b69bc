using System.Net;
using System.Text.Json;

namespace OpsLvp.FaultCases;

/// <summary>
/// The data folder's filesystem stops under the running server as after a fatal I/O error (ext4 on a loop device,
/// <c>EXT4_IOC_SHUTDOWN</c>; docs/reliability.md "Storage faults", the SIGBUS hunt): the server must stay alive, refuse
/// pushes with 503 and say <c>failing</c>; after the filesystem is mounted again every reading it acknowledged is there,
/// the chain verifies, and a new start records again. Rows of <see cref="StorageRun.Group"/>.
/// </summary>
public static class ShutdownRun
{
    public const string Name = "filesystem shut down (ext4, as after an I/O error)";

    public const string AfterName = "after the shutdown: remounted, nothing acknowledged lost, records again";

    public static async Task RunAsync(int cycles, string folder, FaultTally tally, Action<string> log)
    {
        ArgumentNullException.ThrowIfNull(tally);
        ArgumentNullException.ThrowIfNull(log);
        if (LoopFilesystem.CannotMount() is { } why)
        {
            tally.Skipped(StorageRun.Group, Name, why);
            return;
        }
        for (var cycle = 0; cycle < cycles; cycle++)
        {
            using var fs = LoopFilesystem.Create(Path.Combine(folder, $"shutdown-{cycle}"), 64);
            var profile = FaultProfile.Write(Path.Combine(folder, $"profile-{cycle}"));
            var pushes = new Pushes(DateTimeOffset.FromUnixTimeMilliseconds(DateTimeOffset.UtcNow.AddSeconds(-60).ToUnixTimeMilliseconds()));
            var started = DateTimeOffset.UtcNow.AddMinutes(-1);
            string? broke = null;
            using (var server = await ServerProcess.StartAsync(fs.Root, profile))
            {
                for (var i = 0; i < 5 && broke is null; i++)
                {
                    if (await pushes.PushAsync(server.Client, 50) != HttpStatusCode.Accepted)
                    {
                        broke = "not recording before the shutdown";
                    }
                }
                if (cycle % 2 == 1)
                {
                    Sync(); // the -shm pages clean (written back) when the filesystem stops
                }
                fs.ShutDown(Path.Combine(fs.Root, "opslvp.db"));
                var refused = 0;
                for (var i = 0; i < 30 && broke is null; i++)
                {
                    var status = await pushes.PushAsync(server.Client, 50);
                    if (status is null)
                    {
                        broke = $"push got no answer ({server.ExitDescription ?? "process alive"}): {string.Join(" | ", server.LastLines.TakeLast(5))}";
                    }
                    else if (status is not (HttpStatusCode.Accepted or HttpStatusCode.ServiceUnavailable))
                    {
                        broke = $"push answered {(int)status}";
                    }
                    else if (status == HttpStatusCode.ServiceUnavailable)
                    {
                        refused++;
                    }
                    await Task.Delay(50);
                }
                if (broke is null && server.HasExited)
                {
                    broke = $"server died: {server.ExitDescription}";
                }
                if (broke is null && refused == 0)
                {
                    broke = "never refused a push after the shutdown";
                }
                if (broke is null && await HealthAsync(server) is var health && health != "failing")
                {
                    broke = $"/health said {health} after the shutdown";
                }
                server.Kill();
            }
            Record(tally, Name, broke, cycle);

            fs.Unmount();
            fs.Mount();
            string? after;
            using (var facts = new StoredFacts(Path.Combine(fs.Root, "opslvp.db")))
            {
                var missing = await facts.MissingAsync(pushes.Acknowledged, started);
                after = missing.Count > 0 ? $"{missing.Count} of {pushes.Acknowledged.Count} acknowledged readings not stored" : await facts.CheckChainAsync([]);
            }
            if (after is null)
            {
                using var again = await ServerProcess.StartAsync(fs.Root, profile);
                pushes.SkipTo(DateTimeOffset.UtcNow.AddSeconds(-5));
                after = await pushes.PushAsync(again.Client, 10) == HttpStatusCode.Accepted ? null : "a new start on the remounted filesystem did not record";
                again.Kill();
            }
            Record(tally, AfterName, after, cycle);
            log($"shutdown cycle {cycle + 1}/{cycles}: {broke ?? "held"}; after: {after ?? "held"}");
            fs.Unmount();
        }
    }

    private static void Sync()
    {
        using var process = System.Diagnostics.Process.Start("sync");
        process?.WaitForExit();
    }

    private static async Task<string> HealthAsync(ServerProcess server)
    {
        using var response = await server.Client.GetAsync(new Uri("/health", UriKind.Relative));
        using var document = JsonDocument.Parse(await response.Content.ReadAsStringAsync());
        return document.RootElement.GetProperty("status").GetString() ?? "(none)";
    }

    private static void Record(FaultTally tally, string name, string? broke, int cycle)
    {
        if (broke is null)
        {
            tally.Held(StorageRun.Group, name);
        }
        else
        {
            tally.Broke(StorageRun.Group, name, $"cycle {cycle}: {broke}");
        }
    }
}
