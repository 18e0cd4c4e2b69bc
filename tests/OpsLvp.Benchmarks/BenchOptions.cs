namespace OpsLvp.Benchmarks;

/// <summary>
/// Command line: <c>[--quick] [--only engine,audit,review,push,circuits,pg-audit,anchors,year] [--days N] [--out FOLDER] [--data-dir FOLDER]</c>.
/// The <c>year</c> suite (a database filled with <see cref="Days"/> days of readings, issue 16) and <c>push-ha</c> (push
/// latency through two nodes and Redis, issue 16; needs PostgreSQL and redis-server) and <c>inbox</c> (the reading
/// inbox's throughput through two nodes, issue 16; needs PostgreSQL) run only when named.
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

    public bool Runs(string suite) => Only.Contains(suite);

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
                case "--data-dir":
                    options = options with { DataDir = Path.GetFullPath(Value()) };
                    break;
                default:
                    throw new ArgumentException($"unknown argument '{args[i]}' (use --quick, --only {string.Join(",", Suites)}, --days N, --out FOLDER, --data-dir FOLDER)");
            }
        }
        return options;
    }
}
