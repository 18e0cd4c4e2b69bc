using System.Runtime.CompilerServices;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Engine;

/// <summary>
/// The LVP engine of docs/engine.md (R1–R17) as a pure function (state, inputs, now) → (state, events): no clock,
/// no I/O, the same in live runs and replays. Time semantics:
/// <list type="bullet">
/// <item>A reading is fresh from its time until, exclusive, time + the kind's maximum age (profile; 120 s when
/// the profile gives none). A condition that depends on it starts holding when the reading is applied (its
/// arrival, <c>now</c>), and stops at the stale instant.</item>
/// <item>Between <see cref="EngineState.EvaluatedAt"/> and <c>now</c> (exclusive) the engine steps through every
/// critical instant (dwell completions, readings going stale, items falling due) in time order and stamps events
/// with that exact instant (docs/engine.md R7), so one evaluation at the end gives the events of evaluating every second.</item>
/// <item>Then the inputs are applied in order at <c>now</c> before <c>now</c> is judged (R17): readings first as one
/// batch, each command seeing the state at <c>now</c> with the inputs before it; a reading arriving at the instant
/// the previous one goes stale therefore leaves no gap. A <c>now</c> earlier than the state's instant is treated as
/// the state's instant.</item>
/// </list>
/// Entry conditions are strict (value &lt; below), recovery inclusive (value ≥ recover); unknown inputs can
/// escalate on what is known and never relax (R5).
/// </summary>
public sealed partial class LvpEngine(AerodromeProfile profile)
{
    /// <summary>What every screen says while the active condition holds and safeguards are open (docs/engine.md R13).</summary>
    public const string SafeguardsIncompleteHeadline = "LVP conditions met — safeguards incomplete";

    private const int MaxTransitionsPerInstant = 8;

    private readonly EngineModel _model = new(profile);

    /// <summary>
    /// States an engine returned whose final step at their <see cref="EngineState.EvaluatedAt"/> changed nothing,
    /// with the profile applied: a step is a pure function of (profile, state, instant), so stepping such a state
    /// again at that instant with the same profile changes nothing either and is skipped. Keyed by reference
    /// (states and profiles are immutable); entries go with their states.
    /// </summary>
    private static readonly ConditionalWeakTable<EngineState, Tuple<AerodromeProfile, DateTimeOffset>> Settled = new();

    /// <summary>The profile this engine applies.</summary>
    public AerodromeProfile Profile => _model.Profile;

    /// <summary>The state at start: normal, nothing known, monitoring from <paramref name="now"/>.</summary>
    public EngineState Initial(DateTimeOffset now) => new()
    {
        EvaluatedAt = now,
        PhaseSince = now,
        MonitoringSince = now,
    };

    /// <summary>Advances <paramref name="state"/> to <paramref name="now"/>, then applies <paramref name="inputs"/> at <paramref name="now"/>.</summary>
    public EngineResult Evaluate(EngineState state, IReadOnlyList<EngineInput> inputs, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(inputs);
        var run = new Run(_model, state);
        if (Settled.TryGetValue(state, out var settled) && ReferenceEquals(settled.Item1, _model.Profile))
        {
            run.Settled(settled.Item2);
        }
        var start = state.EvaluatedAt;
        if (now < start)
        {
            now = start;
        }
        if (now > start)
        {
            // start is final once time moves past it (its inputs came with earlier calls)
            run.Step(start);
        }
        var t = start;
        // critical instants strictly before now; now itself is judged only after its inputs are applied (docs/engine.md R17)
        while (t < now && run.NextCriticalInstant(t, now) is { } next && next < now)
        {
            run.Step(next);
            t = next;
        }
        foreach (var input in inputs)
        {
            switch (input)
            {
                case ReadingInput r:
                    run.Accept(r.Reading, now);
                    break;
                case ForecastInput f:
                    // like a command: sees the state at now with the inputs before it (docs/engine.md R25)
                    run.Step(now);
                    run.AcceptForecast(f, now);
                    run.Step(now);
                    break;
                case EngineCommand c:
                    // the command sees the state at now with every input before it applied
                    run.Step(now);
                    run.Apply(c, now);
                    run.Step(now);
                    break;
                default:
                    break;
            }
        }
        run.Step(now);
        var isSettled = run.IsSettled(now);
        run.State = run.State with { EvaluatedAt = now };
        if (isSettled)
        {
            Settled.AddOrUpdate(run.State, Tuple.Create(_model.Profile, now));
        }
        return new EngineResult(run.State, run.Events);
    }

    /// <summary>What displays show: governing values with freshness, per-runway RVR, thresholds, and what the engine waits for.</summary>
    public EngineStatus Describe(EngineState state, DateTimeOffset now) =>
        StatusBuilder.Build(_model, state, now) with { Forecast = DescribeForecast(state, now) };
}
