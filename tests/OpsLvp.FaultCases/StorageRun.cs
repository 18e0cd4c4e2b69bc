using System.Net;
using System.Text.Json;

namespace OpsLvp.FaultCases;

/// <summary>
/// Storage faults under the real server process on a small tmpfs (docs/reliability.md "Storage faults"): the disk fills
/// and frees again, the folder turns read-only (a read-only bind mount) and writable again, and the kernel is asked to
/// make the tmpfs itself read-only. Each cycle holds when every push is answered 202 or 503 and nothing else, the
/// server stays alive, <c>/health</c> says failing while it cannot record and ok once it records again; at the end every
/// acknowledged reading is stored and the chain verifies. Skipped, with the reason, where this process cannot mount.
/// </summary>
public static class StorageRun
{
    public const string Group = "storage fault";

    public static async Task RunAsync(int diskFullCycles, int readOnlyCycles, string folder, FaultTally tally, Action<string> log)
    {
        ArgumentNullException.ThrowIfNull(tally);
        ArgumentNullException.ThrowIfNull(log);
        if (SmallMount.CannotMount() is { } why)
        {
            if (diskFullCycles > 0)
            {
                tally.Skipped(Group, "disk full, then space back", why);
            }
            if (readOnlyCycles > 0)
            {
                tally.Skipped(Group, "folder read-only (bind), then writable", why);
            }
            return;
        }
        using var fs = SmallMount.Mount(folder, 32);
        var profile = FaultProfile.Write(fs.Root);
        var pushes = new Pushes(DateTimeOffset.FromUnixTimeMilliseconds(DateTimeOffset.UtcNow.AddSeconds(-60).ToUnixTimeMilliseconds()));
        var started = DateTimeOffset.UtcNow.AddMinutes(-1);
        using (var server = await ServerProcess.StartAsync(fs.Root, profile))
        {
            for (var i = 0; i < diskFullCycles; i++)
            {
                var broke = await CycleAsync(server, pushes, () => fs.Fill(), fs.Free, mustRefuse: true);
                Tally(tally, "disk full, then space back", broke, i);
            }
            for (var i = 0; i < readOnlyCycles; i++)
            {
                // files already open stay writable through their descriptors: the server may go on recording (202)
                var broke = await CycleAsync(server, pushes, fs.SetReadOnly, fs.SetWritable, mustRefuse: false);
                Tally(tally, "folder read-only (bind), then writable", broke, i);
            }
            if (readOnlyCycles > 0)
            {
                if (fs.TryRemountReadOnly() is { } refused)
                {
                    tally.Skipped(Group, "tmpfs remounted read-only", $"the kernel refuses while the server has files open for writing: {refused}");
                }
                else
                {
                    var broke = await CycleAsync(server, pushes, () => { }, fs.RemountWritable, mustRefuse: false);
                    Tally(tally, "tmpfs remounted read-only", broke, 0);
                }
            }
            server.Kill();
            if (server.ExitDescription is { } exit && diskFullCycles + readOnlyCycles > 0)
            {
                log($"storage: server ended with {exit} after the kill");
            }
        }
        using var facts = new StoredFacts(Path.Combine(fs.Root, "opslvp.db"));
        var acknowledged = pushes.Acknowledged;
        var missing = await facts.MissingAsync(acknowledged, started);
        var chain = await facts.CheckChainAsync([]);
        var result = missing.Count > 0 ? $"{missing.Count} of {acknowledged.Count} acknowledged readings not stored" : chain;
        Tally(tally, "afterwards: acknowledged stored, chain verifies", result, 0);
        tally.Note("storage-readings", $"storage faults: {acknowledged.Count:N0} acknowledged readings checked, {missing.Count:N0} not stored; {pushes.Refused:N0} pushes refused with 503");
    }

    /// <summary>One fault and its repair; null when it held, else what broke.</summary>
    private static async Task<string?> CycleAsync(ServerProcess server, Pushes pushes, Action fault, Action repair, bool mustRefuse)
    {
        for (var i = 0; i < 3; i++)
        {
            if (await pushes.PushAsync(server.Client, 100) != HttpStatusCode.Accepted)
            {
                return "not recording before the fault";
            }
        }
        fault();
        var refused = false;
        try
        {
            for (var i = 0; i < 300 && !(mustRefuse && refused); i++)
            {
                var status = await pushes.PushAsync(server.Client, 100);
                if (status is null)
                {
                    return $"push got no answer during the fault ({server.ExitDescription ?? "process alive"}): {string.Join(" | ", server.LastLines.TakeLast(5))}";
                }
                if (status is not (HttpStatusCode.Accepted or HttpStatusCode.ServiceUnavailable))
                {
                    return $"push answered {(int)status} during the fault";
                }
                refused |= status == HttpStatusCode.ServiceUnavailable;
                if (!mustRefuse && i >= 40)
                {
                    break;
                }
            }
            if (server.HasExited)
            {
                return $"server died during the fault: {server.ExitDescription}";
            }
            if (mustRefuse && !refused)
            {
                return "never refused a push while the disk was full";
            }
            if (refused && await HealthStatusAsync(server) is var during && during != "failing")
            {
                return $"/health said {during} while pushes were refused";
            }
        }
        finally
        {
            repair();
        }
        var deadline = DateTime.UtcNow.AddSeconds(60);
        while (await pushes.PushAsync(server.Client, 10) != HttpStatusCode.Accepted)
        {
            if (DateTime.UtcNow > deadline || server.HasExited)
            {
                return $"recording did not resume within 60 s of the repair ({server.ExitDescription ?? "process alive"})";
            }
            await Task.Delay(200);
        }
        return await HealthStatusAsync(server) is var after && after == "ok" ? null : $"/health said {after} after recording resumed";
    }

    private static async Task<string> HealthStatusAsync(ServerProcess server)
    {
        using var response = await server.Client.GetAsync(new Uri("/health", UriKind.Relative));
        using var document = JsonDocument.Parse(await response.Content.ReadAsStringAsync());
        return document.RootElement.GetProperty("status").GetString() ?? "(none)";
    }

    private static void Tally(FaultTally tally, string name, string? broke, int cycle)
    {
        if (broke is null)
        {
            tally.Held(Group, name);
        }
        else
        {
            tally.Broke(Group, name, $"cycle {cycle}: {broke}");
        }
    }
}
