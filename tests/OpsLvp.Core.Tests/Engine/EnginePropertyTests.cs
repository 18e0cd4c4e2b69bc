using CsCheck;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// Property tests (CsCheck) of docs/engine.md R2–R10 and R17 invariants over random invented weather: values cluster around
/// the test profile's illustrative thresholds, sensors fall silent at random, gaps range up to 150 s so
/// readings also go stale (max age 120 s RVR, 300 s ceiling, invented).
/// </summary>
public class EnginePropertyTests
{
    private const int Iterations = 150;

    /// <summary>One arrival instant: RVR per governing sensor (null: silent) and ceiling (null: silent), plus an optional command.</summary>
    public sealed record Step(int Gap, double?[] Rvr, double? Ceiling, int Command);

    private static readonly Gen<double?> RvrValue = Gen.OneOf<double?>(null, 300, 500, 540, 560, 600, 640, 650, 660, 800, 990, 1000, 1090, 1100, 1200, 1500, 2000);
    private static readonly Gen<double?> CeilingValue = Gen.OneOf<double?>(null, 150, 199, 200, 240, 250, 290, 300, 340, 350, 400, 5000, 5000, 5000);

    private static Gen<Step[]> Scenario(int commandKinds) =>
        Gen.Select(Gen.Int[1, 150], RvrValue.Array[3], CeilingValue, Gen.Int[0, commandKinds], (gap, rvr, ceiling, cmd) => new Step(gap, rvr, ceiling, cmd))
            .Array[1, 60];

    /// <summary>Commands mixed into the scenarios (index 0 and anything above the list: none).</summary>
    private static EngineCommand? Command(int index) => index switch
    {
        1 => new SetForecast("dm (invented)", true, "forecast (invented)"),
        2 => new SetForecast("dm (invented)", false, "forecast cleared (invented)"),
        3 => new TickItem("kim (invented)", "airside", "C1"),
        4 => new SetSensorService("dm (invented)", "RVR25T", false, "fault (invented)"),
        5 => new SetSensorService("dm (invented)", "RVR25T", true, "repaired (invented)"),
        6 => new CancelLvp("dm (invented)", "judgement (invented)"),
        7 => new DeclarePhase("dm (invented)", Phase.Preparation, "judgement (invented)"),
        8 => new ReleaseHold("dm (invented)", "judgement (invented)"),
        9 => new ConfirmPending("dm (invented)"),
        10 => new TickItem("ash (invented)", "lighting", "P2"),
        _ => null,
    };

    private static List<(int Time, EngineInput[] Inputs)> Timeline(Step[] steps)
    {
        var list = new List<(int, EngineInput[])>();
        var t = 0;
        foreach (var s in steps)
        {
            t += s.Gap;
            var inputs = new List<EngineInput>();
            for (var i = 0; i < 3; i++)
            {
                if (s.Rvr[i] is { } v)
                {
                    inputs.Add(EngineDriver.Rvr(t, TestProfiles.GoverningRvr[i], v));
                }
            }
            if (s.Ceiling is { } c)
            {
                inputs.Add(EngineDriver.Ceiling(t, c));
            }
            if (Command(s.Command) is { } command)
            {
                inputs.Add(command);
            }
            list.Add((t, inputs.ToArray()));
        }
        return list;
    }

    private static EngineDriver RunOnce(Step[] steps, OpsLvp.Core.Profile.AerodromeProfile? profile = null, int tickEvery = 0)
    {
        var d = new EngineDriver(profile);
        var last = 0;
        foreach (var (time, inputs) in Timeline(steps))
        {
            if (tickEvery > 0)
            {
                for (var t = last + tickEvery; t < time; t += tickEvery)
                {
                    d.Run(t);
                }
            }
            d.Run(time, inputs);
            last = time;
        }
        var end = last + 2000;
        if (tickEvery > 0)
        {
            for (var t = last + tickEvery; t < end; t += tickEvery)
            {
                d.Run(t);
            }
        }
        d.Run(end);
        return d;
    }

    /// <summary>Escalations (R8); cancellation → preparation is the end of cancellation, not an escalation.</summary>
    private static bool IsEscalation(PhaseTransition t) =>
        (t.From, t.To) is (Phase.Normal, Phase.Preparation) or (Phase.Normal, Phase.Active) or (Phase.Preparation, Phase.Active) or (Phase.Cancellation, Phase.Active);

    private static List<string> Lines(EngineDriver d) => d.Events.Select(EventJson.ToLine).ToList();

    [Fact]
    public void ReplayingTheSameInputs_GivesTheSameEvents()
    {
        Scenario(12).Sample(steps => Assert.Equal(Lines(RunOnce(steps)), Lines(RunOnce(steps))), iter: Iterations);
    }

    [Fact]
    public void EvaluatingInOneStep_OrInManySmallSteps_GivesTheSameEventsAtTheSameInstants()
    {
        var confirming = TestProfiles.Confirming(new OpsLvp.Core.Profile.TransitionRule(Phase.Preparation, Phase.Active));
        Gen.Select(Scenario(12), Gen.Int[1, 13], Gen.Bool, (steps, tick, confirm) => (steps, tick, confirm))
            .Sample(x =>
            {
                var profile = x.confirm ? confirming : TestProfiles.Standard();
                Assert.Equal(Lines(RunOnce(x.steps, profile)), Lines(RunOnce(x.steps, profile, x.tick)));
            }, iter: Iterations);
    }

    /// <summary>
    /// docs/engine.md R17: splitting the evaluation calls (each instant's readings in one call and every command in
    /// its own call at the same instant, plus empty calls at random instants between arrivals, some exactly where
    /// readings go stale) or merging them (one call per arrival instant) gives the same events. Gaps of exactly
    /// 120 s are frequent, so readings often arrive at the instant the previous ones go stale.
    /// </summary>
    [Fact]
    public void SplittingOrMergingEvaluationCalls_GivesTheSameEvents()
    {
        var gap = Gen.OneOf(Gen.Int[1, 150], Gen.Const(120), Gen.Const(60));
        var steps = Gen.Select(gap, RvrValue.Array[3], CeilingValue, Gen.Int[0, 12], (g, rvr, ceiling, cmd) => new Step(g, rvr, ceiling, cmd)).Array[1, 60];
        Gen.Select(steps, Gen.Int[0, 1_000_000].Array[0, 30], Gen.Bool, (x, extra, safeguarded) => (x, extra, safeguarded)).Sample(c =>
        {
            var profile = c.safeguarded ? TestProfiles.Safeguarded() : TestProfiles.Standard();
            var timeline = Timeline(c.x);
            var merged = new EngineDriver(profile);
            foreach (var (time, inputs) in timeline)
            {
                merged.Run(time, inputs);
            }
            var end = timeline[^1].Time + 2000;
            merged.Run(end);

            var split = new EngineDriver(profile);
            var arrivals = timeline.Select(x => x.Time).ToHashSet();
            // extra instants strictly between arrivals (never at one): the stale instants of the readings and random ones
            var extras = c.extra.Select(e => e % end).Concat(timeline.Select(x => x.Time + 120)).Concat(timeline.Select(x => x.Time + 300))
                .Where(e => e > 0 && e < end && !arrivals.Contains(e)).Distinct().Order().ToList();
            var next = 0;
            foreach (var (time, inputs) in timeline)
            {
                for (; next < extras.Count && extras[next] < time; next++)
                {
                    split.Run(extras[next]);
                }
                split.Run(time, [.. inputs.OfType<ReadingInput>()]);
                foreach (var command in inputs.OfType<EngineCommand>())
                {
                    split.Run(time, command);
                }
            }
            for (; next < extras.Count; next++)
            {
                split.Run(extras[next]);
            }
            split.Run(end);
            Assert.Equal(Lines(merged), Lines(split));
        }, iter: Iterations);
    }

    /// <summary>
    /// Independent oracle for recovery at an instant, from the generated arrivals: every governing sensor's
    /// latest reading is fresh and ≥ the RVR limit, and the ceilometer's too (docs/engine.md R3, R5).
    /// </summary>
    private static bool RecoveryHeldAt(List<(int Time, EngineInput[] Inputs)> timeline, int instant, double rvrLimit, double ceilingLimit)
    {
        bool FreshAtLeast(string sensor, ReadingKind kind, int maxAge, double limit)
        {
            var latest = timeline.Where(x => x.Time <= instant)
                .SelectMany(x => x.Inputs.OfType<ReadingInput>().Select(r => r.Reading))
                .LastOrDefault(r => r.SensorId == sensor && r.Kind == kind);
            return latest is not null && instant < (latest.Time - TestProfiles.T0).TotalSeconds + maxAge && latest.Value >= limit;
        }
        return TestProfiles.GoverningRvr.All(s => FreshAtLeast(s, ReadingKind.Rvr, 120, rvrLimit))
            && FreshAtLeast("CEIL1", ReadingKind.CloudBase, 300, ceilingLimit);
    }

    [Fact]
    public void StaleOrMissingData_NeverRelaxes_AndNoRelaxationComesBeforeItsDwell()
    {
        Scenario(0).Sample(steps =>
        {
            var timeline = Timeline(steps);
            var d = RunOnce(steps);
            foreach (var t in d.Transitions.Where(t => t.By == TransitionBy.Auto))
            {
                (int Dwell, double Rvr, double Ceiling)? rule = (t.From, t.To) switch
                {
                    (Phase.Active, Phase.Cancellation) => (600, 650, 250),
                    (Phase.Preparation, Phase.Normal) => (900, 1100, 350),
                    _ => null,
                };
                if (rule is not { } r)
                {
                    continue;
                }
                Assert.True(t.Snapshot.RecoveryInputsComplete, $"relaxed at {t.At} with incomplete inputs");
                var at = (int)(t.At - TestProfiles.T0).TotalSeconds;
                for (var s = at - r.Dwell; s <= at; s++)
                {
                    Assert.True(RecoveryHeldAt(timeline, s, r.Rvr, r.Ceiling), $"{t.From}->{t.To} at {at} s but recovery did not hold at {s} s");
                }
            }
        }, iter: Iterations);
    }

    [Fact]
    public void PhaseChanges_NeverFlapFasterThanTheDwellsAllow()
    {
        Scenario(0).Sample(steps =>
        {
            var transitions = RunOnce(steps).Transitions.ToList();
            for (var i = 1; i < transitions.Count; i++)
            {
                var (a, b) = (transitions[i - 1], transitions[i]);
                var gap = (b.At - a.At).TotalSeconds;
                var relaxation = (b.From, b.To) is (Phase.Active, Phase.Cancellation) or (Phase.Preparation, Phase.Normal);
                if (relaxation)
                {
                    Assert.True(gap >= (b.From == Phase.Active ? 600 : 900), $"{b.From}->{b.To} only {gap} s after {a.From}->{a.To}");
                }
                var escalationAfterRelaxation = (a.From, a.To) is (Phase.Active, Phase.Cancellation) or (Phase.Preparation, Phase.Normal)
                    && IsEscalation(b);
                if (escalationAfterRelaxation)
                {
                    Assert.True(gap >= 30, $"{b.From}->{b.To} only {gap} s after {a.From}->{a.To}");
                }
            }
        }, iter: Iterations);
    }

    [Fact]
    public void SilentGoverningSensor_NeverLetsTheEpisodeRelax()
    {
        // any weather, then a long good tail in which RVR25T never reports again
        Gen.Select(Scenario(0), Gen.Int[0, 2], (steps, silent) => (steps, silent)).Sample(x =>
        {
            var tail = Enumerable.Range(0, 40)
                .Select(_ => new Step(60, [.. Enumerable.Range(0, 3).Select(i => i == x.silent ? (double?)null : 2000)], 5000, 0));
            var d = RunOnce([.. x.steps, .. tail]);
            var silentSince = TestProfiles.T0.AddSeconds(x.steps.Sum(s => s.Gap) + 120);
            Assert.DoesNotContain(d.Transitions, t => t.At >= silentSince && t.By == TransitionBy.Auto
                && (t.From, t.To) is (Phase.Active, Phase.Cancellation) or (Phase.Preparation, Phase.Normal));
        }, iter: Iterations);
    }

    [Fact]
    public void AfterAManualRelaxation_AutomaticEscalationWaitsItsDwellFromTheAction()
    {
        Scenario(12).Sample(steps =>
        {
            var transitions = RunOnce(steps).Transitions.ToList();
            for (var i = 1; i < transitions.Count; i++)
            {
                var (a, b) = (transitions[i - 1], transitions[i]);
                if (a.By == TransitionBy.Manual && (a.From, a.To) is (Phase.Active, Phase.Cancellation) or (Phase.Preparation, Phase.Normal)
                    && b.By == TransitionBy.Auto && IsEscalation(b))
                {
                    Assert.True((b.At - a.At).TotalSeconds >= 30, $"{b.From}->{b.To} at {b.At} only {(b.At - a.At).TotalSeconds} s after the manual {a.From}->{a.To}");
                }
            }
        }, iter: Iterations);
    }
}
