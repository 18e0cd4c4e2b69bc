namespace OpsLvp.Benchmarks;

/// <summary>
/// Command line: <c>[--quick] [--only engine,audit,review,push,circuits,pg-audit,anchors,year] [--days N] [--out FOLDER] [--data-dir FOLDER]
/// [--rounds N] [--counts N,N,…] [--clients-in-process] [--nodes-in-process]</c>.
/// The <c>year</c> suite (a database filled with <see cref="Days"/> days of readings, issue 16) and <c>push-ha</c> (push
/// latency through two nodes and Redis, issue 16; needs PostgreSQL and redis-server) and <c>inbox</c> (the reading
/// inbox's throughput through two nodes, issue 16; needs PostgreSQL) run only when named. The last four options are
/// push-ha's. (<c>--role clients</c> alone makes the program push-ha's client process, see <c>Live/ProbeProcess.cs</c>;
/// <c>--role node</c> alone one of its server nodes, see <c>Live/NodeProcess.cs</c>.)
/// </summary>
public sealed record BenchOptions
{
    public static readonly string[] Suites = ["engine", "audit", "review", "push", "circuits", "pg-audit", "anchors", "year", "push-ha", "inbox"];

    /// <summary>Few iterations and small harness counts; the whole run stays under 3 minutes.</summary>
    public bool Quick { get; init; }

    public IReadOnlySet<string> Only { get; init; } = new HashSet<string>(Suites.Where(s => s is not "year" and not "push-ha" and not "inbox"));

    /// <summary>Days of 15-second readings the <c>year</c> suite fills (365: about 23 million rows).</summary>
    public int Days { get; init; } = 365;

    /// <summary>Where the results file and BenchmarkDotNet's artifacts go.</summary>
    public string OutFolder { get; init; } = Path.Combine(Directory.GetCurrentDirectory(), "BenchmarkDotNet.Artifacts");

    /// <summary>Where the audit benchmarks put their database files (a folder on the disk under test).</summary>
    public string? DataDir { get; init; }

    /// <summary>push-ha: measured rounds per client count and configuration; null: 60 (quick: 5).</summary>
    public int? Rounds { get; init; }

    /// <summary>push-ha: the client counts; null: 1, 20, 100, 500 (quick: 1, 20, 100).</summary>
    public IReadOnlyList<int>? ClientCounts { get; init; }

    /// <summary>push-ha: the hub clients in the servers' process, as before 2026-12-03, instead of a process of their own.</summary>
    public bool ClientsInProcess { get; init; }

    /// <summary>push-ha: every server node in the benchmark's own process, as before 2026-12-03 10:00 UTC, instead of each in a process of its own.</summary>
    public bool NodesInProcess { get; init; }

    public bool Runs(string suite) => Only.Contains(suite);

    /// <summary>The push-ha options as given on the command line (empty when none), for the command a result names.</summary>
    public string PushHaArguments() =>
        (Rounds is { } rounds ? $" --rounds {rounds}" : "")
        + (ClientCounts is { } counts ? $" --counts {string.Join(',', counts)}" : "")
        + (ClientsInProcess ? " --clients-in-process" : "")
        + (NodesInProcess ? " --nodes-in-process" : "");

    /// <summary>Parses the arguments; unknown ones give a message naming them.</summary>
    /// <exception cref="ArgumentException">An unknown option or suite, or an option missing its value.</exception>
    public static BenchOptions Parse(IReadOnlyList<string> args)
    {
        var options = new BenchOptions();
        for (var i = 0; i < args.Count; i++)
        {
            string Value()
            {
                if (i + 1 >= args.Count)
                {
                    throw new ArgumentException($"{args[i]} needs a value");
                }
                return args[++i];
            }
            switch (args[i])
            {
                case "--quick":
                    options = options with { Quick = true };
                    break;
                case "--only":
                    var only = Value().Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries).ToHashSet(StringComparer.OrdinalIgnoreCase);
                    var unknown = only.Where(s => !Suites.Contains(s, StringComparer.OrdinalIgnoreCase)).ToList();
                    if (unknown.Count > 0 || only.Count == 0)
                    {
                        throw new ArgumentException($"--only: unknown suite '{string.Join(",", unknown)}' (use {string.Join(", ", Suites)})");
                    }
                    options = options with { Only = only.Select(s => s.ToLowerInvariant()).ToHashSet() };
                    break;
                case "--out":
                    options = options with { OutFolder = Path.GetFullPath(Value()) };
                    break;
                case "--days":
                    options = options with { Days = int.TryParse(Value(), out var days) && days is >= 1 and <= 3660 ? days : throw new ArgumentException("--days must be a whole number from 1 to 3660") };
                    break;
                case "--rounds":
                    options = options with { Rounds = int.TryParse(Value(), out var rounds) && rounds is >= 1 and <= 10_000 ? rounds : throw new ArgumentException("--rounds must be a whole number from 1 to 10000") };
                    break;
                case "--counts":
                    var counts = Value().Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)
                        .Select(c => int.TryParse(c, out var n) && n is >= 1 and <= 5000 ? n : throw new ArgumentException($"--counts: '{c}' is not a whole number from 1 to 5000"))
                        .ToList();
                    options = options with { ClientCounts = counts.Count > 0 ? counts : throw new ArgumentException("--counts needs at least one client count, e.g. --counts 1,20") };
                    break;
                case "--clients-in-process":
                    options = options with { ClientsInProcess = true };
                    break;
                case "--nodes-in-process":
                    options = options with { NodesInProcess = true };
                    break;
                case "--data-dir":
                    options = options with { DataDir = Path.GetFullPath(Value()) };
                    break;
                default:
                    throw new ArgumentException($"unknown argument '{args[i]}' (use --quick, --only {string.Join(",", Suites)}, --days N, --out FOLDER, --data-dir FOLDER, --rounds N, --counts N,N, --clients-in-process, --nodes-in-process)");
            }
        }
        return options;
    }
}
