using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Engine.Replay;

/// <summary>
/// Scenario replays (files in Scenarios/, all invented; thresholds illustrative, docs/engine.md R4/R5 examples) with
/// the transitions expected at exact times, run through the replay code the CLI and server use.
/// </summary>
public class ReplayScenarioTests
{
    public static string Scenario(string file) => Path.Combine(AppContext.BaseDirectory, "Engine", "Replay", "Scenarios", file);

    private static ReplayResult Replay(string profile, string name, bool actions = true)
    {
        var readingsFile = Scenario($"{name}.readings.csv");
        var actionsFile = Scenario($"{name}.actions.csv");
        return ReplayRunner.Run(
            ProfileLoader.Load(Scenario(profile)),
            ReadingsCsv.Parse(File.ReadAllText(readingsFile), readingsFile),
            actions ? ActionsCsv.Parse(File.ReadAllText(actionsFile), actionsFile) : []);
    }

    private static List<string> Transitions(ReplayResult r) =>
        r.Events.OfType<PhaseTransition>().Select(t => $"{t.At.UtcDateTime:HH:mm:ss} {t.From}->{t.To} {t.By}").ToList();

    [Fact]
    public void R7_DwellsCompleteAtTheExactInstant_BetweenReadings()
    {
        var r = Replay("xdmo-profile.json", "r7-dwell", actions: false);
        // 900 m at 03:00:50 + 30 s dwell; 520 m at 03:01:45 + 30 s dwell (invented values)
        Assert.Equal(["03:01:20 Normal->Preparation Auto", "03:02:15 Preparation->Active Auto"], Transitions(r));
        var rejected = r.Events.OfType<ReadingRejected>().Select(e => e.Reason).ToList();
        Assert.Equal([RejectReason.OlderThanLatest, RejectReason.StatusNotOk], rejected);
        Assert.Equal(520, r.FinalState.Latest[EngineState.SensorKey("RVR07M", ReadingKind.Rvr)].Value);
    }

    [Fact]
    public void R8_WholeEpisode_PreparationActiveCancellationAndBack()
    {
        var r = Replay("xdmo-profile.json", "r8-episode");
        Assert.Equal(
        [
            "03:05:30 Normal->Preparation Auto",
            "03:10:30 Preparation->Active Auto",
            "03:30:00 Active->Cancellation Auto",
            "03:32:00 Cancellation->Preparation Auto", // C1 done before recovery from preparation held 15 min (since 03:20)
            "03:35:00 Preparation->Normal Auto",
        ], Transitions(r));
        Assert.Equal(3, r.Events.OfType<ItemTicked>().Count());
        Assert.Empty(r.Events.OfType<CommandRefused>());
        var ended = Assert.Single(r.Events.OfType<EpisodeEnded>());
        Assert.Equal(Phase.Active, ended.DeepestPhase);
    }

    [Fact]
    public void R9_DeclareHoldReleaseAndCancelAgainstTheConditions()
    {
        var r = Replay("xdmo-profile.json", "r9-manual");
        Assert.Equal(
        [
            "03:02:00 Normal->Active Manual",
            "03:15:00 Active->Cancellation Auto", // hold released; recovery held since 03:00
            "03:16:00 Cancellation->Normal Auto",
            "03:20:30 Normal->Preparation Auto",
            "03:22:00 Preparation->Normal Manual",
            "03:22:30 Normal->Preparation Auto", // dwell measured from the cancel (R9)
        ], Transitions(r));
        var refused = Assert.Single(r.Events.OfType<CommandRefused>());
        Assert.Equal("a reason is required to cancel", refused.Reason);
    }

    [Fact]
    public void R10_ProposalWithdrawnWhenConditionStops_ThenConfirmedKeepingBothInstants()
    {
        var r = Replay("xdmo-confirm-profile.json", "r10-confirm");
        Assert.Equal(["03:02:30 Normal->Preparation Auto", "03:09:10 Preparation->Active Manual"], Transitions(r));
        Assert.Equal(["03:05:30", "03:08:30"], r.Events.OfType<TransitionProposed>().Select(p => $"{p.At.UtcDateTime:HH:mm:ss}"));
        Assert.Equal("03:06:00", $"{Assert.Single(r.Events.OfType<ProposalWithdrawn>()).At.UtcDateTime:HH:mm:ss}");
        var active = r.Events.OfType<PhaseTransition>().Last();
        Assert.Equal("03:08:30", $"{active.ProposedAt!.Value.UtcDateTime:HH:mm:ss}");
        Assert.Equal("no raised alarm 'pending'", Assert.Single(r.Events.OfType<CommandRefused>()).Reason);
    }
}
