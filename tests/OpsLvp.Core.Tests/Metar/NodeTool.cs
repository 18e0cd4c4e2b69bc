using System.Diagnostics;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>Finds and runs node and npm for the METAR cross-check.</summary>
internal static class NodeTool
{
    private static readonly Lazy<bool> s_available = new(() => TryRun("node", "--version") && TryRun(Npm, "--version"));

    public static bool IsAvailable => s_available.Value;

    public static bool IsRequired =>
        Environment.GetEnvironmentVariable("OPSLVP_REQUIRE_BROWSER") == "1"
        || string.Equals(Environment.GetEnvironmentVariable("CI"), "true", StringComparison.OrdinalIgnoreCase);

    public static string Npm => OperatingSystem.IsWindows() ? "npm.cmd" : "npm";

    /// <summary>Runs a program to completion; returns exit code, stdout and stderr. Throws if it does not end in time.</summary>
    public static (int ExitCode, string Stdout, string Stderr) Run(string file, string workingDirectory, TimeSpan timeout, params string[] args)
    {
        var info = new ProcessStartInfo(file)
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }
        using var process = Process.Start(info) ?? throw new InvalidOperationException($"could not start {file}");
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(timeout))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException($"{file} {string.Join(' ', args)} did not finish within {timeout}");
        }
        return (process.ExitCode, stdout.Result, stderr.Result);
    }

    private static bool TryRun(string file, string arg)
    {
        try
        {
            return Run(file, AppContext.BaseDirectory, TimeSpan.FromSeconds(30), arg).ExitCode == 0;
        }
        catch (Exception ex) when (ex is System.ComponentModel.Win32Exception or InvalidOperationException or TimeoutException)
        {
            return false;
        }
    }
}
