using System.Globalization;
using System.Text;
using BenchmarkDotNet.Reports;

namespace OpsLvp.Benchmarks.Reporting;

/// <summary>
/// Collects every figure of the run as a row (what, value, ratio against a baseline of the same run, target) and
/// prints them and writes them as Markdown for docs/benchmarks.md.
/// </summary>
public sealed class ResultsBook(BenchOptions options)
{
    private readonly List<ResultRow> _rows = [];
    private readonly List<string> _notes = [];

    public IReadOnlyList<ResultRow> Rows => _rows;

    public void Add(ResultRow row) => _rows.Add(row);

    public void Note(string note) => _notes.Add(note);

    /// <summary>One row per case of <paramref name="summary"/>: mean and allocation, ratio against the baseline with the same parameters.</summary>
    public void AddSummary(string section, Summary summary, string command, Func<string, double, string?>? target = null)
    {
        var cases = summary.Reports
            .Where(r => r.ResultStatistics is not null)
            .Select(r => new
            {
                Name = r.BenchmarkCase.Descriptor.WorkloadMethodDisplayInfo.Trim('\''),
                Params = r.BenchmarkCase.Parameters.DisplayInfo,
                r.BenchmarkCase.Descriptor.Baseline,
                Mean = r.ResultStatistics!.Mean,
                Allocated = r.GcStats.GetBytesAllocatedPerOperation(r.BenchmarkCase),
            })
            .ToList();
        foreach (var c in cases)
        {
            var baseline = cases.FirstOrDefault(b => b.Baseline && b.Params == c.Params);
            var name = string.IsNullOrEmpty(c.Params) || c.Params == "Empty" ? c.Name : $"{c.Name} {c.Params}";
            _rows.Add(new ResultRow(
                section,
                name,
                FormatTime(c.Mean),
                baseline is null || c.Baseline ? null : c.Mean / baseline.Mean,
                baseline is null ? null : baseline.Name,
                c.Allocated is { } a ? FormatBytes(a) : null,
                target?.Invoke(c.Name, c.Mean),
                command));
        }
    }

    /// <summary>Mean time in nanoseconds of a case, for derived ratios (e.g. FULL/NORMAL).</summary>
    public static double? Mean(Summary summary, string method, params (string Name, object Value)[] parameters) =>
        summary.Reports.FirstOrDefault(r => r.BenchmarkCase.Descriptor.WorkloadMethod.Name == method
            && parameters.All(p => Equals(r.BenchmarkCase.Parameters[p.Name], p.Value)))?.ResultStatistics?.Mean;

    public string ToMarkdown()
    {
        var sb = new StringBuilder();
        sb.AppendLine(CultureInfo.InvariantCulture, $"## Results ({(options.Quick ? "quick mode: few iterations, small harness counts" : "full mode")}, {DateTimeOffset.UtcNow:yyyy-MM-dd HH:mm} UTC)");
        sb.AppendLine();
        sb.AppendLine("| Machine | |");
        sb.AppendLine("|---|---|");
        foreach (var (name, value) in MachineInfo.Describe())
        {
            sb.AppendLine(CultureInfo.InvariantCulture, $"| {name} | {value} |");
        }
        foreach (var section in _rows.Select(r => r.Section).Distinct())
        {
            sb.AppendLine();
            sb.AppendLine(CultureInfo.InvariantCulture, $"### {section}");
            sb.AppendLine();
            var command = _rows.First(r => r.Section == section).Command;
            sb.AppendLine(CultureInfo.InvariantCulture, $"Command: `{command}`");
            sb.AppendLine();
            sb.AppendLine("| Figure | Value | Ratio | against | Allocated | Target |");
            sb.AppendLine("|---|---:|---:|---|---:|---|");
            foreach (var r in _rows.Where(r => r.Section == section))
            {
                var ratio = r.Ratio is { } x ? x.ToString("0.00", CultureInfo.InvariantCulture) : r.Against is null ? "" : "1.00 (baseline)";
                sb.AppendLine(CultureInfo.InvariantCulture, $"| {r.Figure} | {r.Value} | {ratio} | {(r.Ratio is null ? "" : r.Against)} | {r.Allocated} | {r.Target} |");
            }
        }
        if (_notes.Count > 0)
        {
            sb.AppendLine();
            foreach (var note in _notes)
            {
                sb.AppendLine(CultureInfo.InvariantCulture, $"- {note}");
            }
        }
        return sb.ToString();
    }

    /// <summary>Writes the Markdown to the out folder and returns its path.</summary>
    public string Write()
    {
        Directory.CreateDirectory(options.OutFolder);
        var suites = string.Join("-", BenchOptions.Suites.Where(options.Runs));
        var path = Path.Combine(options.OutFolder, $"opslvp-results-{(options.Quick ? "quick" : "full")}-{suites}.md");
        File.WriteAllText(path, ToMarkdown());
        return path;
    }

    public static string FormatTime(double nanoseconds) => nanoseconds switch
    {
        < 1_000 => string.Create(CultureInfo.InvariantCulture, $"{nanoseconds:0.0} ns"),
        < 1_000_000 => string.Create(CultureInfo.InvariantCulture, $"{nanoseconds / 1_000:0.00} µs"),
        < 1_000_000_000 => string.Create(CultureInfo.InvariantCulture, $"{nanoseconds / 1_000_000:0.00} ms"),
        _ => string.Create(CultureInfo.InvariantCulture, $"{nanoseconds / 1_000_000_000:0.000} s"),
    };

    public static string FormatBytes(double bytes) => bytes switch
    {
        < 1024 => string.Create(CultureInfo.InvariantCulture, $"{bytes:0} B"),
        < 1024 * 1024 => string.Create(CultureInfo.InvariantCulture, $"{bytes / 1024:0.0} KiB"),
        _ => string.Create(CultureInfo.InvariantCulture, $"{bytes / 1024 / 1024:0.00} MiB"),
    };
}
