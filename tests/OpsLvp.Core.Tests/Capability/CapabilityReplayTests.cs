using System.Globalization;
using System.Text;
using CsCheck;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Tests.Engine;

namespace OpsLvp.Core.Tests.Capability;

/// <summary>
/// docs/engine.md R30–R37 through <c>opslvp replay</c>'s runner and its CSV actions (docs/replay.md), and live = replay.
/// The night, its readings and every name are invented; minima as in <see cref="CapabilityTestProfiles"/>.
/// </summary>
public class CapabilityReplayTests
{
    private static readonly DateTimeOffset T0 = TestProfiles.T0;

    private static string Time(double minutes) => T0.AddMinutes(minutes).UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    /// <summary>
    /// An invented night: clear until 10 min, fog at 300 m from 10 min, the 07 TDZ sensor silent from 40 min while the
    /// fog lifts to 700 m at MID and END, readings every minute until 60 min.
    /// </summary>
    private static IReadOnlyList<Reading> Night()
    {
        var csv = new StringBuilder(ReadingsCsv.Header).Append('\n');
        for (var m = 0; m <= 60; m++)
        {
            var rvr = m < 10 ? 2000 : m < 40 ? 300 : 700;
            if (m < 40)
            {
                csv.Append(CultureInfo.InvariantCulture, $"{Time(m)},RVR07T,rvr,{rvr},ok\n");
            }
            csv.Append(CultureInfo.InvariantCulture, $"{Time(m)},RVR07M,rvr,{rvr},ok\n");
            csv.Append(CultureInfo.InvariantCulture, $"{Time(m)},RVR25T,rvr,{rvr},ok\n");
            csv.Append(CultureInfo.InvariantCulture, $"{Time(m)},CEIL1,cloud_base,5000,ok\n");
        }
        return ReadingsCsv.Parse(csv.ToString(), "night.csv");
    }

    private static string Actions(bool withObserver) =>
        ActionsCsv.Header + "\n"
        + $"{Time(30)},ash (invented),facility,tdzl-07,unserviceable:lighting,TDZ light circuit fault (invented)\n"
        + $"{Time(32)},dm (invented),ack,capability-down:07,,\n"
        + (withObserver ? $"{Time(43)},dm (invented),observer_rvr,07/tdz,700:sam (invented),edge lights counted (invented)\n" : "");

    private static ReplayResult Replay(bool withObserver) =>
        ReplayRunner.Run(CapabilityEngineTests.Profile(), Night(), ActionsCsv.Parse(Actions(withObserver), "night.actions.csv"), T0.AddMinutes(50));

    private static RunwayCapability At(ReplayResult result, double minutes) =>
        result.Events.OfType<CapabilityChanged>().Last(c => c.At <= T0.AddMinutes(minutes)).After.Single(c => c.Direction == "07");

    [Fact]
    public void TdzLightFault_DowngradesCatIIIToCatII_AndTheAlarmIsAcknowledged()
    {
        var result = Replay(withObserver: true);

        Assert.Equal(OperationKind.CatIII, At(result, 29).BestApproach);
        Assert.Equal(OperationKind.CatII, At(result, 30).BestApproach);
        Assert.Equal("CAT III: TDZ lights 07 unserviceable (TDZ light circuit fault (invented))", OpsLvp.Core.Presentation.CapabilityWords.FirstReason(At(result, 30)));
        // the fog itself took CAT I away at 10 min (a downgrade too); the fault's alarm is raised at 30 min
        var raised = result.Events.OfType<AlarmRaised>().Single(a => a.Alarm.Kind == AlarmKind.CapabilityDowngrade && a.At == T0.AddMinutes(30));
        Assert.Equal("runway 07 in use down from 07 CAT III, LVTO available to 07 CAT II, LVTO available", raised.Alarm.Message);
        Assert.Contains(result.Events.OfType<AlarmAcknowledged>(), a => a.Key == "capability-down:07" && a.At == T0.AddMinutes(32));
        var line = EventJson.ToLine(result.Events.OfType<CapabilityChanged>().Single(c => c.At == T0.AddMinutes(30)));
        Assert.Contains("\"event\":\"capability_changed\"", line, StringComparison.Ordinal);
        Assert.Contains("\"before\":\"07 CAT III, LVTO available\",\"after\":\"07 CAT II, LVTO available\"", line, StringComparison.Ordinal);
        Assert.Contains("TDZ lights 07 unserviceable (TDZ light circuit fault (invented))", line, StringComparison.Ordinal);
    }

    [Fact]
    public void ObserverRvr_KeepsCatIAvailable_DuringTheSensorFailure()
    {
        var with = Replay(withObserver: true);
        var without = Replay(withObserver: false);

        // RVR07T's last reading at 39 min is stale at 41 min (max age 120 s, invented)
        var silent = At(without, 45);
        Assert.Null(silent.BestApproach);
        Assert.Equal(ReasonKind.RvrPositionSilent, silent.Operations.Single(o => o.Kind == OperationKind.CatI).Reasons.Single().Kind);

        var observed = At(with, 45);
        var cat1 = observed.Operations.Single(o => o.Kind == OperationKind.CatI);
        Assert.True(cat1.Available);
        Assert.True(cat1.UsesObserverRvr);
        Assert.Equal(Phase.Active, with.FinalState.Phase); // a silent governing sensor blocks recovery (docs/engine.md R5)
        Assert.Equal(OperationKind.CatII, observed.BestApproach); // CAT III still needs the TDZ lights
    }

    /// <summary>A random capability command, or none.</summary>
    private static EngineCommand? Command(int i) => i switch
    {
        1 => new SetFacilityStatus("ash (invented)", "tdzl-07", FacilityStatus.Unserviceable, "fault (invented)", "lighting"),
        2 => new SetFacilityStatus("ash (invented)", "tdzl-07", FacilityStatus.Serviceable, "fixed (invented)", "lighting"),
        3 => new SetFacilityStatus("dm (invented)", "power", FacilityStatus.Degraded, "one set (invented)"),
        4 => new SetRunwayInUse("dm (invented)", "07/25", "25", "wind (invented)"),
        5 => new SetRunwayInUse("dm (invented)", "07/25", "07", "wind (invented)"),
        6 => new EnterObserverRvr("dm (invented)", "07", RvrPosition.Tdz, 600, "sam (invented)"),
        7 => new SetSensorService("dm (invented)", "RVR07T", false, "fault (invented)"),
        8 => new SetSensorService("dm (invented)", "RVR07T", true, "fixed (invented)"),
        9 => new AcknowledgeAlarm("dm (invented)", "capability-down:07"),
        _ => null,
    };

    [Fact]
    public void LiveEqualsReplay_WithAnyExtraEvaluationsBetweenInputs()
    {
        var profile = CapabilityEngineTests.Profile();
        var gen = Gen.Select(Gen.Int[1, 200], Gen.OneOf<double?>(null, 100, 150, 300, 550, 700, 2000).Array[3], Gen.Int[0, 14], Gen.Int[0, 3], (gap, rvr, cmd, extra) => (gap, rvr, cmd, extra)).Array[1, 40];
        gen.Sample(steps =>
        {
            var readings = new List<Reading>();
            var actions = new List<TimedCommand>();
            var t = 0;
            var live = new EngineDriver(profile);
            var liveEvents = new List<string>();
            for (var k = 0; k < steps.Length; k++)
            {
                var (gap, rvr, cmd, extra) = steps[k];
                if (k > 0)
                {
                    // the live host evaluates on its own ticks too: extra evaluations between inputs change nothing (R17)
                    for (var e = 1; e <= extra; e++)
                    {
                        liveEvents.AddRange(live.Run(t + (gap * e / (extra + 1.0))).Select(EventJson.ToLine));
                    }
                    t += gap;
                }
                var batch = new List<Reading>();
                string[] sensors = ["RVR07T", "RVR07M", "RVR25T"];
                for (var i = 0; i < 3; i++)
                {
                    if (rvr[i] is { } v)
                    {
                        batch.Add(new Reading(T0.AddSeconds(t), sensors[i], ReadingKind.Rvr, v));
                    }
                }
                foreach (var r in batch)
                {
                    readings.Add(r);
                    liveEvents.AddRange(live.Run(t, new ReadingInput(r)).Select(EventJson.ToLine));
                }
                if (Command(cmd) is { } c)
                {
                    actions.Add(new TimedCommand(T0.AddSeconds(t), c));
                    liveEvents.AddRange(live.Run(t, c).Select(EventJson.ToLine));
                }
            }
            if (readings.Count == 0 || readings[0].Time != T0)
            {
                return; // the replay starts at its first input and the live run at T0: compare runs whose first input is a reading at T0
            }
            liveEvents.AddRange(live.Run(t).Select(EventJson.ToLine)); // as the replay's final advance to its end
            var replay = ReplayRunner.Run(profile, readings, actions, T0.AddSeconds(t));
            Assert.Equal(liveEvents, replay.Events.Select(EventJson.ToLine));
            Assert.True(CapabilityEvaluator.Same(live.State.Capability, replay.FinalState.Capability));
        }, iter: 200);
    }
}
