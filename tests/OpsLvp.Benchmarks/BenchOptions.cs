namespace OpsLvp.Benchmarks;

/// <summary>
/// Command line: <c>[--quick] [--only engine,audit,review,push,circuits] [--out FOLDER] [--data-dir FOLDER]</c>.
/// </summary>
public sealed record BenchOptions
{
    public static readonly string[] Suites = ["engine", "audit", "review", "push", "circuits"];

    /// <summary>Few iterations and small harness counts; the whole run stays under 3 minutes.</summary>
    public bool Quick { get; init; }

    public IReadOnlySet<string> Only { get; init; } = new HashSet<string>(Suites);

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
                case "--data-dir":
                    options = options with { DataDir = Path.GetFullPath(Value()) };
                    break;
                default:
                    throw new ArgumentException($"unknown argument '{args[i]}' (use --quick, --only {string.Join(",", Suites)}, --out FOLDER, --data-dir FOLDER)");
            }
        }
        return options;
    }
}
