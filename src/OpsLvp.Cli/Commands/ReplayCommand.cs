using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Review;

namespace OpsLvp.Cli.Commands;

/// <summary>
/// `opslvp replay --profile P.json --readings R.csv [--actions A.csv] [--forecasts F.csv] [--until TIME]` (docs/cli.md): runs the
/// engine over the files and writes one JSON line per event. Formats: docs/replay.md.
/// `opslvp replay --episode E.json [--profile other.json]` replays an episode export (docs/review.md) with its own
/// profile or another one (what-if).
/// </summary>
public sealed class ReplayCommand : ICliCommand
{
    public IReadOnlyList<string> Path { get; } = ["replay"];

    public string Usage => "opslvp replay --profile P.json --readings R.csv [--actions A.csv] [--forecasts F.csv] [--until TIME] | opslvp replay --episode E.json [--profile P.json]";

    public int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr)
    {
        var options = new Dictionary<string, string>(StringComparer.Ordinal);
        for (var i = 0; i < args.Count; i++)
        {
            var name = args[i];
            if (name is not ("--profile" or "--readings" or "--actions" or "--forecasts" or "--until" or "--episode"))
            {
                throw new CliUsageException($"unknown option '{name}'; usage: {Usage}");
            }
            if (i + 1 >= args.Count)
            {
                throw new CliUsageException($"{name} needs a value");
            }
            if (!options.TryAdd(name, args[++i]))
            {
                throw new CliUsageException($"{name} given twice");
            }
        }
        if (options.TryGetValue("--episode", out var episodePath))
        {
            return RunEpisode(episodePath, options, stdout, stderr);
        }
        if (!options.TryGetValue("--profile", out var profilePath) || !options.TryGetValue("--readings", out var readingsPath))
        {
            throw new CliUsageException($"--profile and --readings are required; usage: {Usage}");
        }
        if (LoadProfile(profilePath, stderr) is not { } profile)
        {
            return 1;
        }
        var readings = ReadingsCsv.Parse(File.ReadAllText(readingsPath), readingsPath);
        var actions = options.TryGetValue("--actions", out var actionsPath)
            ? ActionsCsv.Parse(File.ReadAllText(actionsPath), actionsPath)
            : [];
        var forecasts = options.TryGetValue("--forecasts", out var forecastsPath)
            ? ForecastsCsv.Parse(File.ReadAllText(forecastsPath), forecastsPath)
            : [];
        DateTimeOffset? until = null;
        if (options.TryGetValue("--until", out var untilText))
        {
            until = DateTimeOffset.TryParse(untilText, System.Globalization.CultureInfo.InvariantCulture, System.Globalization.DateTimeStyles.AdjustToUniversal, out var u) && untilText.EndsWith('Z')
                ? u
                : throw new CliUsageException($"--until must be an ISO 8601 UTC time ending in Z, not '{untilText}'");
        }
        var result = ReplayRunner.Run(profile, readings, actions, forecasts, until);
        foreach (var e in result.Events)
        {
            stdout.WriteLine(EventJson.ToLine(e));
        }
        return 0;
    }

    private int RunEpisode(string episodePath, Dictionary<string, string> options, TextWriter stdout, TextWriter stderr)
    {
        if (options.ContainsKey("--readings") || options.ContainsKey("--actions") || options.ContainsKey("--forecasts") || options.ContainsKey("--until"))
        {
            throw new CliUsageException($"--episode takes its readings, actions and end from the export; only --profile may be added; usage: {Usage}");
        }
        if (!File.Exists(episodePath))
        {
            stderr.WriteLine($"error: episode export '{episodePath}' not found");
            return 1;
        }
        EpisodeExport export;
        try
        {
            export = EpisodeExport.Parse(File.ReadAllText(episodePath));
        }
        catch (FormatException ex)
        {
            stderr.WriteLine($"error: {episodePath}: {ex.Message.ReplaceLineEndings(" ")}");
            return 1;
        }
        AerodromeProfile? profile = null;
        if (options.TryGetValue("--profile", out var profilePath))
        {
            profile = LoadProfile(profilePath, stderr);
            if (profile is null)
            {
                return 1;
            }
        }
        foreach (var e in export.Replay(profile).Events)
        {
            stdout.WriteLine(EventJson.ToLine(e));
        }
        return 0;
    }

    /// <summary>
    /// Loads and validates a profile (docs/engine.md R6, the same checks the server applies). On a problem writes one line
    /// to stderr naming the file and the first field at fault, with a count of the others, and returns null.
    /// </summary>
    private static AerodromeProfile? LoadProfile(string path, TextWriter stderr)
    {
        AerodromeProfile profile;
        try
        {
            profile = ProfileLoader.Load(path);
        }
        catch (ProfileException ex)
        {
            stderr.WriteLine($"error: {path}: {ex.Message.ReplaceLineEndings(" ")}");
            return null;
        }
        var result = ProfileValidator.Validate(profile);
        if (result.IsValid)
        {
            return profile;
        }
        var first = result.Problems[0];
        var more = result.Problems.Count - 1;
        var tail = more switch
        {
            0 => "",
            1 => " (and 1 more problem)",
            _ => $" (and {more} more problems)",
        };
        stderr.WriteLine($"error: {path}: invalid profile: {first.Field}: {first.Message.ReplaceLineEndings(" ")}{tail}");
        return null;
    }
}
