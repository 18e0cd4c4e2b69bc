using System.Globalization;
using System.Runtime.InteropServices;
using System.Text.RegularExpressions;

namespace OpsLvp.Benchmarks.Reporting;

/// <summary>The machine the figures come from: cores (nproc), CPU model (lscpu), memory, OS, .NET.</summary>
public static partial class MachineInfo
{
    public static IReadOnlyList<(string Name, string Value)> Describe()
    {
        var model = "unknown";
        try
        {
            var cpuinfo = File.ReadAllLines("/proc/cpuinfo").FirstOrDefault(l => l.StartsWith("model name", StringComparison.Ordinal));
            if (cpuinfo is not null)
            {
                model = cpuinfo[(cpuinfo.IndexOf(':', StringComparison.Ordinal) + 1)..].Trim();
            }
        }
        catch (IOException)
        {
            // Not Linux: leave unknown.
        }
        var memory = "unknown";
        try
        {
            var line = File.ReadAllLines("/proc/meminfo").FirstOrDefault(l => l.StartsWith("MemTotal", StringComparison.Ordinal));
            if (line is not null && Digits().Match(line) is { Success: true } m)
            {
                memory = string.Create(CultureInfo.InvariantCulture, $"{long.Parse(m.Value, CultureInfo.InvariantCulture) / 1024.0 / 1024.0:0.0} GiB");
            }
        }
        catch (IOException)
        {
            // Not Linux: leave unknown.
        }
        return
        [
            ("Cores (nproc)", Environment.ProcessorCount.ToString(CultureInfo.InvariantCulture)),
            ("CPU (lscpu model name)", model),
            ("Memory", memory),
            ("OS", RuntimeInformation.OSDescription),
            (".NET", RuntimeInformation.FrameworkDescription),
        ];
    }

    [GeneratedRegex("[0-9]+")]
    private static partial Regex Digits();
}
