using OpsLvp.Core.Optics;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine.Replay;

/// <summary>
/// Replays readings and actions through <see cref="LvpEngine"/> exactly as a live run would see them
/// (the CLI's `opslvp replay` and the server's review and what-if use this):
/// readings in the given (file) order, each evaluated at now = max(its time, previous now), so an
/// out-of-order reading is ignored for state as it would be live (docs/engine.md R2); actions merged by time, a
/// reading first when times are equal. The engine starts at the first input's instant. Raw extinction and
/// transmittance readings are turned into RVR by <see cref="RvrDerivation"/> and the derived RVR reading is
/// evaluated with its raw reading, as the live host does.
/// </summary>
public static class ReplayRunner
{
    /// <summary>Runs the replay; with <paramref name="until"/> the engine is finally advanced to that instant so trailing dwells complete.</summary>
    public static ReplayResult Run(
        AerodromeProfile profile,
        IReadOnlyList<Reading> readings,
        IReadOnlyList<TimedCommand> actions,
        DateTimeOffset? until = null) => Run(profile, readings, actions, [], until);

    /// <summary>
    /// Runs the replay with forecasts (docs/replay.md "Forecasts"): each forecast is an input at its receipt time,
    /// merged with the actions by time (on equal times actions first, then forecasts, each in file order), a reading first
    /// when times are equal.
    /// </summary>
    public static ReplayResult Run(
        AerodromeProfile profile,
        IReadOnlyList<Reading> readings,
        IReadOnlyList<TimedCommand> actions,
        IReadOnlyList<ForecastInput> forecasts,
        DateTimeOffset? until = null)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(readings);
        ArgumentNullException.ThrowIfNull(actions);
        ArgumentNullException.ThrowIfNull(forecasts);
        var engine = new LvpEngine(profile);
        var derivation = new RvrDerivation(profile);
        var ordered = actions.Select((a, i) => (Time: a.Time, Input: (EngineInput)a.Command, Order: i))
            .Concat(forecasts.Select((f, i) => (Time: f.ReceivedAt, Input: (EngineInput)f, Order: actions.Count + i)))
            .OrderBy(x => x.Time).ThenBy(x => x.Order).Select(x => (x.Time, x.Input)).ToList();
        var firsts = new List<DateTimeOffset>();
        if (readings.Count > 0)
        {
            firsts.Add(readings[0].Time);
        }
        if (ordered.Count > 0)
        {
            firsts.Add(ordered[0].Time);
        }
        if (firsts.Count == 0)
        {
            return new ReplayResult([], engine.Initial(until ?? DateTimeOffset.UnixEpoch));
        }
        var now = firsts.Min();
        var state = engine.Initial(now);
        var events = new List<EngineEvent>();
        var r = 0;
        var a = 0;
        while (r < readings.Count || a < ordered.Count)
        {
            var readingNow = r < readings.Count ? Max(readings[r].Time, now) : (DateTimeOffset?)null;
            List<EngineInput> inputs;
            if (a < ordered.Count && (readingNow is null || ordered[a].Time < readingNow))
            {
                now = Max(ordered[a].Time, now);
                inputs = [ordered[a++].Input];
            }
            else
            {
                now = readingNow!.Value;
                var reading = readings[r++];
                derivation.ManualStep = state.ManualLightStep; // the duty manager's setting as of now (docs/engine.md R20)
                inputs = [new ReadingInput(reading), .. derivation.Observe(reading).Select(d => new ReadingInput(d))];
            }
            var result = engine.Evaluate(state, inputs, now);
            state = result.State;
            events.AddRange(result.Events);
        }
        if (until is { } end && end > now)
        {
            var result = engine.Evaluate(state, [], end);
            state = result.State;
            events.AddRange(result.Events);
        }
        return new ReplayResult(events, state);
    }

    private static DateTimeOffset Max(DateTimeOffset a, DateTimeOffset b) => a > b ? a : b;
}
