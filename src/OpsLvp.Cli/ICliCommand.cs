namespace OpsLvp.Cli;

/// <summary>One `opslvp` sub-command. Writes JSON to <c>stdout</c>; on bad input one line to <c>stderr</c> and a non-zero exit.</summary>
public interface ICliCommand
{
    /// <summary>The words that select the command, e.g. ["metar", "decode"].</summary>
    IReadOnlyList<string> Path { get; }

    /// <summary>One-line usage shown by `opslvp --help`.</summary>
    string Usage { get; }

    /// <summary>Runs with the arguments after <see cref="Path"/>; returns the exit code.</summary>
    int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr);
}
