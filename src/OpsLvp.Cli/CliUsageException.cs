namespace OpsLvp.Cli;

/// <summary>The command line itself is wrong (missing or unknown option); exit code 2.</summary>
public sealed class CliUsageException(string message) : Exception(message);
