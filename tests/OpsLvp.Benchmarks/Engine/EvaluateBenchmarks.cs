using BenchmarkDotNet.Attributes;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;

namespace OpsLvp.Benchmarks.Engine;

/// <summary>
/// One engine evaluation with the full demo aerodrome (9 RVR sensors, 2 ceilometers, 3 checklists) in an LVP
/// episode, 15 s after the previous one. Baseline: the same evaluation with no inputs (the engine only advances time).
/// </summary>
[MemoryDiagnoser]
public class EvaluateBenchmarks
{
    private LvpEngine _engine = null!;
    private EngineState _state = null!;
    private DateTimeOffset _next;
    private EngineInput[] _oneReading = [];
    private EngineInput[] _fullCycle = [];

    /// <summary>Phase of the warmed state, printed beside the results so the scenario is visible.</summary>
    public static Phase WarmPhase { get; private set; }

    [GlobalSetup]
    public void Setup()
    {
        var profile = BenchData.DemoProfile();
        _engine = new LvpEngine(profile);
        // 3 h of the fog night ending near its deepest point: every sensor fresh, LVP declared, checklists open.
        var warm = BenchData.FogNight(profile, 6).Take((int)(3 * 3600 / 15) * 11).ToList();
        var replay = ReplayRunner.Run(profile, warm, []);
        _state = replay.FinalState;
        WarmPhase = _state.Phase;
        _next = _state.EvaluatedAt.AddSeconds(15);
        var cycle = warm.Skip(warm.Count - 11).Select(r => new ReadingInput(r with { Time = _next })).ToArray();
        _fullCycle = cycle;
        _oneReading = [cycle[0]];
    }

    [Benchmark(Baseline = true, Description = "Evaluate, no inputs")]
    public EngineResult NoInputs() => _engine.Evaluate(_state, [], _next);

    [Benchmark(Description = "Evaluate, 1 RVR reading")]
    public EngineResult OneReading() => _engine.Evaluate(_state, _oneReading, _next);

    [Benchmark(Description = "Evaluate, 11 readings (9 RVR + 2 ceilometers)")]
    public EngineResult FullCycle() => _engine.Evaluate(_state, _fullCycle, _next);

    [Benchmark(Description = "Describe (status for displays)")]
    public EngineStatus Describe() => _engine.Describe(_state, _next);
}
