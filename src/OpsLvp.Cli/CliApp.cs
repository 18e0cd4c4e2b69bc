namespace OpsLvp.Cli;

/// <summary>Dispatches `opslvp` arguments to a command. Exit codes: 0 ok, 1 bad input, 2 usage, 3 audit chain broken (audit verify, migrate).</summary>
public static class CliApp
{
    /// <summary>Every command the tool knows.</summary>
    public static IReadOnlyList<ICliCommand> Commands { get; } =
    [
        new Commands.RvrCommand(),
        new Commands.MetarDecodeCommand(),
        new Commands.TafDecodeCommand(),
        new Commands.AuditVerifyCommand(),
        new Commands.ReplayCommand(),
        new Commands.MigrateCommand(),
    ];

    /// <summary>Runs the tool in-process (tests call this directly).</summary>
    public static int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr)
    {
        var command = Commands
            .Where(c => c.Path.Count <= args.Count && c.Path.SequenceEqual(args.Take(c.Path.Count), StringComparer.Ordinal))
            .MaxBy(c => c.Path.Count);
        if (command is null)
        {
            stderr.WriteLine(args.Count == 0 || args[0] is "-h" or "--help"
                ? "usage: " + string.Join(" | ", Commands.Select(c => c.Usage))
                : $"error: unknown command '{string.Join(' ', args)}'; see opslvp --help");
            return 2;
        }
        try
        {
            return command.Run(args.Skip(command.Path.Count).ToList(), stdout, stderr);
        }
        catch (CliUsageException ex)
        {
            stderr.WriteLine($"error: {ex.Message}");
            return 2;
        }
        catch (Exception ex) when (ex is FormatException or ArgumentException or IOException or InvalidDataException)
        {
            stderr.WriteLine($"error: {ex.Message.ReplaceLineEndings(" ")}");
            return 1;
        }
    }
}
