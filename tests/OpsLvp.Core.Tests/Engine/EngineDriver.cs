using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>Drives an engine through time in tests: seconds after <see cref="TestProfiles.T0"/>, collecting every event.</summary>
public sealed class EngineDriver
{
    private readonly LvpEngine _engine;

    public EngineDriver(AerodromeProfile? profile = null)
    {
        _engine = new LvpEngine(profile ?? TestProfiles.Standard());
        State = _engine.Initial(TestProfiles.T0);
    }

    public LvpEngine Engine => _engine;

    public EngineState State { get; private set; }

    public List<EngineEvent> Events { get; } = [];

    public static DateTimeOffset At(double seconds) => TestProfiles.T0.AddSeconds(seconds);

    /// <summary>Evaluates at T0 + <paramref name="seconds"/>; returns this call's events.</summary>
    public IReadOnlyList<EngineEvent> Run(double seconds, params EngineInput[] inputs)
    {
        var result = _engine.Evaluate(State, inputs, At(seconds));
        State = result.State;
        Events.AddRange(result.Events);
        return result.Events;
    }

    /// <summary>All governing RVR sensors (07 TDZ/MID/END) read <paramref name="metres"/> at T0 + seconds, and CEIL1 reads <paramref name="ceilingFt"/>.</summary>
    public IReadOnlyList<EngineEvent> Weather(double seconds, double metres, double ceilingFt = 5000) =>
        Run(seconds, [.. TestProfiles.GoverningRvr.Select(s => Rvr(seconds, s, metres)), Ceiling(seconds, ceilingFt)]);

    /// <summary>Sends <see cref="Weather"/> every <paramref name="step"/> seconds from <paramref name="from"/> to <paramref name="to"/> inclusive.</summary>
    public void WeatherFromTo(double from, double to, double metres, double ceilingFt = 5000, double step = 60)
    {
        for (var t = from; t <= to; t += step)
        {
            Weather(t, metres, ceilingFt);
        }
    }

    public static ReadingInput Rvr(double seconds, string sensor, double metres) =>
        new(new Reading(At(seconds), sensor, ReadingKind.Rvr, metres));

    public static ReadingInput Ceiling(double seconds, double feet) =>
        new(new Reading(At(seconds), "CEIL1", ReadingKind.CloudBase, feet));

    public IEnumerable<PhaseTransition> Transitions => Events.OfType<PhaseTransition>();

    public string TransitionLog => string.Join("; ", Transitions.Select(t => $"{(t.At - TestProfiles.T0).TotalSeconds}:{t.From}->{t.To}"));
}
