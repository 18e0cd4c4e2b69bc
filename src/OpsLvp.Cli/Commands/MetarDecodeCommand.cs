using OpsLvp.Core.Metar;

namespace OpsLvp.Cli.Commands;

/// <summary>
/// <c>opslvp metar decode "&lt;text&gt;"</c> (docs/cli.md): the decoded report as JSON on stdout. The report may be
/// given as one argument or as several (the shell split it); they are joined with spaces. Text that is not a METAR
/// or SPECI raises <see cref="MetarFormatException"/>, which the dispatcher writes as one line to stderr (exit 1).
/// </summary>
public sealed class MetarDecodeCommand : ICliCommand
{
    public IReadOnlyList<string> Path { get; } = ["metar", "decode"];

    public string Usage => "metar decode \"<METAR or SPECI text>\"";

    public int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr)
    {
        if (args.Count == 0)
        {
            throw new CliUsageException($"missing report text; usage: opslvp {Usage}");
        }
        var report = MetarDecoder.Decode(string.Join(' ', args));
        stdout.WriteLine(MetarJson.Write(report));
        return 0;
    }
}
