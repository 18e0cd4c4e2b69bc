using BenchmarkDotNet.Attributes;
using OpsLvp.Core.Metar;

namespace OpsLvp.Benchmarks.Engine;

/// <summary>
/// METAR/SPECI decoding over a set of invented XDMO reports; times are per report (so decodes per second =
/// 1 / mean). Baseline: splitting the same reports into their groups, the least any decoder must do.
/// </summary>
[MemoryDiagnoser]
public class MetarBenchmarks
{
    public const int Reports = 500;

    private List<string> _reports = [];

    [GlobalSetup]
    public void Setup()
    {
        _reports = BenchData.Metars(Reports);
        foreach (var report in _reports)
        {
            if (!MetarDecoder.TryDecode(report, out _, out var error))
            {
                throw new InvalidOperationException($"generated METAR does not decode ({error}): {report}");
            }
        }
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Reports, Description = "Split report into groups")]
    public int SplitOnly()
    {
        var n = 0;
        foreach (var report in _reports)
        {
            n += report.Split(' ', StringSplitOptions.RemoveEmptyEntries).Length;
        }
        return n;
    }

    [Benchmark(OperationsPerInvoke = Reports, Description = "MetarDecoder.Decode")]
    public int Decode()
    {
        var n = 0;
        foreach (var report in _reports)
        {
            n += MetarDecoder.Decode(report).Rvr.Count;
        }
        return n;
    }
}
