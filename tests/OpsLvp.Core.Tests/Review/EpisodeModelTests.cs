using OpsLvp.Core.Engine;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;
using OpsLvp.Core.Tests.Engine;

namespace OpsLvp.Core.Tests.Review;

/// <summary>
/// Episode model and checklist performance on a small invented night at XDMO (TestProfiles.Standard: P1 due within
/// 10 min, P2 within 15 min, all values invented).
/// </summary>
public sealed class EpisodeModelTests
{
    private static readonly DateTimeOffset T0 = TestProfiles.T0;
    private static readonly ConditionSnapshot Snap = new(T0, 800, "RVR07T", 400, "CEIL1", false, true, TestProfiles.Standard().Thresholds);

    private static DateTimeOffset M(int minutes) => T0.AddMinutes(minutes);

    private static List<RecordedEvent> Night() =>
    [
        .. new EngineEvent[]
        {
            new PhaseTransition(M(5), Phase.Normal, Phase.Preparation, TransitionBy.Auto, null, "RVR 07 TDZ 800 m < 1000 m", Snap),
            new EpisodeStarted(M(5), "XDMO-EP1"),
            new ChecklistOpened(M(5), Phase.Preparation, ["P1", "P2"]),
            new ItemTicked(M(9), "P1", new ItemTick("a.invented", "airside", M(9), null)),
            new AlarmRaised(M(12), new Alarm("overdue:P2", AlarmKind.ItemOverdue, "P2 overdue (invented)", M(12))),
            new ItemTicked(M(25), "P2", new ItemTick("b.invented", "lighting", M(25), "late, invented")),
            new TransitionProposed(M(30), Phase.Preparation, Phase.Active, "RVR 07 TDZ 500 m < 550 m", Snap),
            new TransitionConfirmed(M(34), "dm.invented", Phase.Preparation, Phase.Active, M(30), null),
            new PhaseTransition(M(34), Phase.Preparation, Phase.Active, TransitionBy.Manual, "dm.invented", "confirmed", Snap, M(30)),
            new ManualActionApplied(M(40), "dm.invented", "sensor_out", "sensor RVR25T out of service", "lens icing (invented)"),
            new PhaseTransition(M(94), Phase.Active, Phase.Normal, TransitionBy.Auto, null, "RVR recovered", Snap),
            new EpisodeEnded(M(94), "XDMO-EP1", M(5), Phase.Active),
        }.Select(RecordedEvent.FromEvent),
    ];

    private static List<Reading> Readings() =>
    [
        new(M(0), "RVR07T", ReadingKind.Rvr, 1500),
        new(M(20), "RVR07T", ReadingKind.Rvr, 500),
        new(M(21), "RVR07M", ReadingKind.Rvr, 350),
        new(M(22), "RVR07M", ReadingKind.Rvr, 100, ReadingStatus.Failed),
        new(M(23), "CEIL1", ReadingKind.CloudBase, 300),
        new(M(24), "CEIL1", ReadingKind.VerticalVisibility, 200),
        new(M(100), "RVR07T", ReadingKind.Rvr, 50),
    ];

    [Fact]
    public void Episode_RunsFromStartedToEnded_WithDeepestPhaseAndCounts()
    {
        var e = Assert.Single(EpisodeModel.Build(Night(), Readings(), M(120)));

        Assert.Equal(("XDMO-EP1", M(5), (DateTimeOffset?)M(94), Phase.Active), (e.Id, e.Start, e.End, e.DeepestPhase));
        Assert.Equal((1, 1, 1, 2, 3), (e.Alarms, e.Confirmations, e.ManualActions, e.Ticks, e.Transitions.Count));
    }

    [Fact]
    public void Episode_LowestValues_CountOnlyOkReadingsInsideTheEpisode()
    {
        var e = EpisodeModel.Build(Night(), Readings(), M(120))[0];

        // 100 m is a failed reading and 50 m comes after the end: neither counts.
        Assert.Equal((350.0, "RVR07M"), (e.LowestRvrM!.Value, e.LowestRvrSensor!));
        // Vertical visibility counts as ceiling (profile default, docs/engine.md R5).
        Assert.Equal(200.0, e.LowestCeilingFt);
    }

    [Fact]
    public void Episode_PhaseIntervals_CoverStartToEnd()
    {
        var e = EpisodeModel.Build(Night(), Readings(), M(120))[0];

        Assert.Equal(
            [new PhaseSpan(Phase.Preparation, M(5), M(34)), new PhaseSpan(Phase.Active, M(34), M(94))],
            e.Phases);
        Assert.Equal(TimeSpan.FromMinutes(60), e.TimeIn(Phase.Active));
    }

    [Fact]
    public void Episode_StillRunning_HasNoEnd_AndItsLastIntervalRunsToNow()
    {
        var events = Night().Where(x => x.At < M(94)).ToList();

        var e = EpisodeModel.Build(events, Readings(), M(60))[0];

        Assert.Null(e.End);
        Assert.Equal(new PhaseSpan(Phase.Active, M(34), M(60)), e.Phases[^1]);
    }

    [Fact]
    public void Performance_PerItem_OpenedDoneByWhomAndLate()
    {
        var perf = ChecklistPerformance.Compute(Night(), TestProfiles.Standard(), M(5), M(94));

        var p1 = perf.Items.Single(i => i.ItemId == "P1");
        var p2 = perf.Items.Single(i => i.ItemId == "P2");
        // P1 due 10 min after opening, done after 4 min; P2 due after 15, done after 20 (TestProfiles, invented).
        Assert.Equal((M(5), M(15), (DateTimeOffset?)M(9), "a.invented", false, "done"), (p1.OpenedAt, p1.DueAt, p1.DoneAt, p1.DoneBy, p1.Late, p1.Outcome));
        Assert.Equal((M(20), "b.invented", true), (p2.DueAt, p2.DoneBy, p2.Late));
        Assert.Equal(TimeSpan.FromMinutes(20), p2.TimeToDone);
    }

    [Fact]
    public void Performance_PreparationToSafeguards_AndConditionToConfirmation()
    {
        var perf = ChecklistPerformance.Compute(Night(), TestProfiles.Standard(), M(5), M(94));

        Assert.Equal(M(5), perf.PreparationStart);
        Assert.Equal(M(25), perf.SafeguardsComplete);
        Assert.Equal(TimeSpan.FromMinutes(20), perf.PreparationToSafeguards);
        var c = Assert.Single(perf.Confirmations);
        Assert.Equal((Phase.Active, "confirmed", (TimeSpan?)TimeSpan.FromMinutes(4), "dm.invented"), (c.To, c.Outcome, c.Delay, c.ConfirmedBy));
        Assert.Equal(TimeSpan.FromMinutes(29), perf.TimeInPhase[Phase.Preparation]);
        Assert.Equal(TimeSpan.FromMinutes(60), perf.TimeInPhase[Phase.Active]);
    }

    [Fact]
    public void Performance_UntickedItem_IsNotDone_AndLateAtTheEnd()
    {
        var events = Night();
        events.Add(RecordedEvent.FromEvent(new ItemUnticked(M(26), "P2", "b.invented", "ticked by mistake (invented)", new ItemTick("b.invented", "lighting", M(25), null))));

        var perf = ChecklistPerformance.Compute(events, TestProfiles.Standard(), M(5), M(94));

        var p2 = perf.Items.Single(i => i.ItemId == "P2");
        Assert.Equal(((DateTimeOffset?)null, "open", true), (p2.DoneAt, p2.Outcome, p2.Late));
        Assert.Null(perf.SafeguardsComplete);
    }

    [Fact]
    public void RecordedCommands_ManualActionsAndTicks_BecomeActionRows()
    {
        var rows = RecordedCommands.FromEvents(Night());

        Assert.Equal(
            ["tick P1 airside", "tick P2 lighting", "confirm  ", "sensor_out RVR25T "],
            rows.Select(r => $"{r.Action} {r.Target} {r.Value}"));
        var commands = RecordedCommands.ToCommands(rows, "test");
        Assert.IsType<SetSensorService>(commands[3].Command);
        Assert.Equal("lens icing (invented)", ((SetSensorService)commands[3].Command).Reason);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(5)]
    public void RecordedCommands_LightStep_ReplaysAsTheStepThatWasSet(int step)
    {
        // docs/engine.md R20: the what-if replays a duty manager's light step through the actions file; event from the engine itself
        var engine = new LvpEngine(TestProfiles.Standard());
        var applied = engine.Evaluate(engine.Initial(M(0)), [new SetLightStep("dm.invented", step, "lights checked (invented)")], M(1)).Events;
        var rows = RecordedCommands.FromEvents(applied.Select(RecordedEvent.FromEvent));
        var command = Assert.Single(RecordedCommands.ToCommands(rows, "test"));
        Assert.Equal(new SetLightStep("dm.invented", step, "lights checked (invented)"), command.Command);
        Assert.Equal(M(1), command.Time);
    }

    [Fact]
    public void RecordedCommands_NotApplicableAndSafeguardsOverride_ReplayAsTheyWereGiven()
    {
        // docs/engine.md R13: the what-if replays an override as "declare active, override" and a not-applicable mark
        List<RecordedEvent> events =
        [
            .. new EngineEvent[]
            {
                new ManualActionApplied(M(1), "dm.invented", "declare", "declared active (hold)", "fog (invented)"),
                new ManualActionApplied(M(1), "dm.invented", "override_safeguards", "active declared with safeguards open: P1, P2", "fog (invented)"),
                new ItemMarkedNotApplicable(M(2), "P2", "dm.invented", "no stop bars (invented)"),
            }.Select(RecordedEvent.FromEvent),
        ];
        var rows = RecordedCommands.FromEvents(events);
        Assert.Equal(["declare active override", "not_applicable P2 "], rows.Select(r => $"{r.Action} {r.Target} {r.Value}"));
        var commands = RecordedCommands.ToCommands(rows, "test");
        Assert.Equal("fog (invented)", Assert.IsType<DeclarePhase>(commands[0].Command).SafeguardsOverride);
        Assert.Equal("no stop bars (invented)", Assert.IsType<MarkNotApplicable>(commands[1].Command).Reason);
        var perf = ChecklistPerformance.Compute(
            [RecordedEvent.FromEvent(new ChecklistOpened(M(1), Phase.Preparation, ["P1", "P2"])), .. events],
            TestProfiles.Standard(), M(0), M(10));
        Assert.Equal(("not_applicable", (DateTimeOffset?)M(2)), (perf.Items.Single(i => i.ItemId == "P2").Outcome, perf.Items.Single(i => i.ItemId == "P2").DoneAt));
    }

    [Fact]
    public void RecordedEvent_NotAnEvent_SaysWhatIsMissing()
    {
        var ex = Assert.Throws<FormatException>(() => RecordedEvent.Parse("{\"time\":\"2026-12-01T03:00:00Z\"}"));
        Assert.Contains("'event'", ex.Message, StringComparison.Ordinal);
        Assert.Null(RecordedEvent.FromAudit(new OpsLvp.Core.Audit.AuditEntry(1, T0, "a", "sign_in", "{\"user\":\"x\"}", new string('0', 64), new string('0', 64))));
    }
}
