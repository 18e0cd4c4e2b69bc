using BenchmarkDotNet.Attributes;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Benchmarks.Engine;

/// <summary>
/// 24 h of 15-second readings from 9 RVR sensors and 2 ceilometers (63 360 readings, invented, fixed seed) through
/// <see cref="ReplayRunner"/>: one evaluation per reading, as live. Baseline: parsing the same readings from their
/// replay CSV without evaluating them.
/// </summary>
[MemoryDiagnoser]
public class ReplayBenchmarks
{
    private AerodromeProfile _profile = null!;
    private List<Reading> _readings = [];
    private string _csv = "";

    /// <summary>Hours of readings; 24 in both modes.</summary>
    public static double Hours { get; set; } = 24;

    public static int ReadingCount { get; private set; }

    [GlobalSetup]
    public void Setup()
    {
        _profile = BenchData.DemoProfile();
        _readings = BenchData.FogNight(_profile, Hours);
        _csv = BenchData.ToCsv(_readings);
        ReadingCount = _readings.Count;
    }

    [Benchmark(Baseline = true, Description = "Parse readings CSV (no evaluation)")]
    public int ParseOnly() => ReadingsCsv.Parse(_csv, "bench.csv").Count;

    [Benchmark(Description = "ReplayRunner.Run over the readings")]
    public int Replay() => ReplayRunner.Run(_profile, _readings, []).Events.Count;
}
