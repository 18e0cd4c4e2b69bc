using System.Diagnostics;
using System.Globalization;
using OpsLvp.FaultCases;

namespace OpsLvp.Faults;

/// <summary>
/// <c>dotnet run -c Release --project tests/OpsLvp.Faults -- --kills 200 --bodies 1000000 --disk-full --read-only</c>:
/// kill -9 cycles under load, generated hostile ingest bodies, disk-full and read-only cycles on a small tmpfs (root
/// only; skipped with the reason otherwise); <c>--fs-shutdown</c> adds ext4-on-loop shutdown cycles (root and loop devices);
/// <c>--tamper</c> runs every tamper case of <see cref="TamperCases"/> on a folder the server recorded (<c>--tamper-rounds N</c>,
/// default 1). Prints tried / held / broke per case, writes the table as markdown
/// (<c>--out</c>, default <c>fault-run.md</c>); <c>--ha-kills N --pg CONNECTION_STRING</c> kills the leader of two nodes on an empty
/// PostgreSQL database N times (docs/reliability.md "Failover") and exits 1 when anything broke. Options: <c>--seed N</c>,
/// <c>--parallel N</c> (hostile senders, default 4), <c>--cycles N</c> (storage cycles each, default 3).
/// </summary>
public static class FaultsProgram
{
    public static async Task<int> Main(string[] args)
    {
        var kills = Int(args, "--kills", 0);
        var bodies = long.Parse(Value(args, "--bodies") ?? "0", CultureInfo.InvariantCulture);
        var seed = Int(args, "--seed", 12);
        var parallel = Int(args, "--parallel", 4);
        var cycles = Int(args, "--cycles", 3);
        var diskFull = args.Contains("--disk-full");
        var readOnly = args.Contains("--read-only");
        var shutdown = args.Contains("--fs-shutdown");
        var tamper = args.Contains("--tamper") ? Int(args, "--tamper-rounds", 1) : 0;
        var output = Value(args, "--out") ?? "fault-run.md";
        var haKills = Int(args, "--ha-kills", 0);
        var pg = Value(args, "--pg");
        if (kills == 0 && bodies == 0 && !diskFull && !readOnly && !shutdown && haKills == 0 && tamper == 0)
        {
            Console.Error.WriteLine("usage: --kills N --bodies N [--disk-full] [--read-only] [--fs-shutdown] [--tamper [--tamper-rounds N]] [--ha-kills N --pg CONNECTION_STRING] [--cycles N] [--seed N] [--parallel N] [--out FILE]");
            return 2;
        }
        if (haKills > 0 && string.IsNullOrWhiteSpace(pg))
        {
            Console.Error.WriteLine("--ha-kills needs --pg with the connection string of an empty PostgreSQL database the run may fill");
            return 2;
        }

        var tally = new FaultTally();
        var root = Path.Combine(Path.GetTempPath(), "opslvp-faults", Guid.NewGuid().ToString("N"));
        var total = Stopwatch.StartNew();
        void Log(string line) => Console.WriteLine($"[{total.Elapsed:hh\\:mm\\:ss}] {line}");
        try
        {
            if (kills > 0)
            {
                Log($"kill -9 cycles: {kills}");
                await KillRun.RunAsync(kills, Path.Combine(root, "kills"), seed, tally, Log);
            }
            if (haKills > 0)
            {
                Log($"failover: kill -9 of the leader of two nodes, {haKills} times");
                await HaKillRun.RunAsync(haKills, Path.Combine(root, "failover"), pg!, seed, tally, Log);
            }
            if (bodies > 0)
            {
                Log($"hostile bodies: {bodies:N0} from {parallel} senders");
                var folder = Path.Combine(root, "hostile");
                var profile = FaultProfile.Write(folder);
                using var server = await ServerProcess.StartAsync(folder, profile);
                await HostileRun.RunAsync(server.Client, bodies, seed, parallel, tally, () => server.ExitDescription, Log);
            }
            if (diskFull || readOnly)
            {
                Log($"storage faults: disk full {(diskFull ? cycles : 0)}, read-only {(readOnly ? cycles : 0)} cycles");
                await StorageRun.RunAsync(diskFull ? cycles : 0, readOnly ? cycles : 0, Path.Combine(root, "storage"), tally, Log);
            }
            if (shutdown)
            {
                Log($"filesystem shutdown cycles: {cycles}");
                await ShutdownRun.RunAsync(cycles, Path.Combine(root, "shutdown"), tally, Log);
            }
            if (tamper > 0)
            {
                Log($"tamper cases: {TamperCases.All.Count}, {tamper} round(s)");
                await TamperRun.RunAsync(tamper, Path.Combine(root, "tamper"), tally, Log);
            }
        }
        finally
        {
            try
            {
                Directory.Delete(root, recursive: true);
            }
            catch (IOException)
            {
            }
        }

        var command = "dotnet run -c Release --project tests/OpsLvp.Faults -- " + string.Join(' ', args);
        var markdown = $"Command: `{command}` (seed {seed}), {total.Elapsed.TotalMinutes:0.0} min, {DateTimeOffset.UtcNow:yyyy-MM-dd HH:mm}Z\n\n" + tally.ToMarkdown();
        await File.WriteAllTextAsync(output, markdown);
        Console.WriteLine();
        Console.WriteLine(markdown);
        Console.WriteLine($"written to {Path.GetFullPath(output)}");
        return tally.Broken == 0 ? 0 : 1;
    }

    private static string? Value(string[] args, string name)
    {
        var at = Array.IndexOf(args, name);
        return at >= 0 && at + 1 < args.Length ? args[at + 1] : null;
    }

    private static int Int(string[] args, string name, int fallback) =>
        Value(args, name) is { } text ? int.Parse(text, CultureInfo.InvariantCulture) : fallback;
}
