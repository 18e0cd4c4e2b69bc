using OpsLvp.Core.Forecast;

namespace OpsLvp.Cli.Commands;

/// <summary>
/// <c>opslvp taf decode "&lt;text&gt;"</c> (docs/forecasts.md): the decoded TAF as JSON on stdout. The report may be given
/// as one argument or as several (the shell split it); they are joined with spaces. Text that is not a TAF raises
/// <see cref="ForecastFormatException"/>, which the dispatcher writes as one line to stderr (exit 1).
/// </summary>
public sealed class TafDecodeCommand : ICliCommand
{
    public IReadOnlyList<string> Path { get; } = ["taf", "decode"];

    public string Usage => "taf decode \"<TAF text>\"";

    public int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr)
    {
        if (args.Count == 0)
        {
            throw new CliUsageException($"missing forecast text; usage: opslvp {Usage}");
        }
        var report = TafDecoder.Decode(string.Join(' ', args));
        stdout.WriteLine(TafJson.Write(report));
        return 0;
    }
}
