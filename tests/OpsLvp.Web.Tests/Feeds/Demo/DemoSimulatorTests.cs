using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Options;
using Microsoft.Extensions.Time.Testing;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Feeds.Demo;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Tests.Feeds.Demo;

/// <summary>The simulator on a fake clock. The scenario rows are invented test data.</summary>
public sealed class DemoSimulatorTests : IDisposable
{
    private const string ReadingsCsv = """
        # invented test scenario
        time,sensor,kind,value,status
        00:00:00,T1,rvr,1500,ok
        00:00:00,C1,cloud_base,300,ok
        00:01:00,T1,rvr,900,ok
        00:02:00,T1,rvr,abc,ok
        00:02:00,T1,rvr,600,failed
        """;

    private const string ActionsCsv = """
        time,actor,action,target,value,reason
        00:01:00,duty-demo,confirm,active,,"invented: fog as forecast"
        """;

    private static readonly DateTimeOffset s_start = new(2026, 1, 15, 2, 0, 0, TimeSpan.Zero);

    private readonly string _folder = Path.Combine(Path.GetTempPath(), "opslvp-sim-tests", Guid.NewGuid().ToString("N"));
    private readonly ReadingPipeline _pipeline = new(Options.Create(new FeedsOptions()));
    private readonly DemoActionQueue _actions = new();
    private readonly FakeTimeProvider _fake = new(s_start);

    public DemoSimulatorTests()
    {
        Directory.CreateDirectory(_folder);
        File.WriteAllText(Path.Combine(_folder, "night.csv"), ReadingsCsv);
        File.WriteAllText(Path.Combine(_folder, "night.actions.csv"), ActionsCsv);
    }

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    private DemoSimulator Simulator(TimeProvider clock, FeedHealthRegistry health, bool demo = true, string scenario = "night.csv", OpsLvp.Web.Cluster.ILeadership? leadership = null, OpsLvp.Web.Engine.IEngineStateView? engine = null) => new(
        Options.Create(new DemoOptions { ScenarioPath = scenario, ActionsPath = "night.actions.csv", LoopGap = TimeSpan.FromMinutes(1) }),
        new DemoMode(demo, 30),
        new ContentPaths(_folder),
        _pipeline,
        _actions,
        health,
        clock,
        NullLogger<DemoSimulator>.Instance,
        leadership,
        engine);

    private async Task<ReadingBatch> NextAsync()
    {
        using var cts = new CancellationTokenSource(TimeSpan.FromSeconds(30));
        await foreach (var batch in _pipeline.ReadAllAsync(cts.Token))
        {
            return batch;
        }

        throw new InvalidOperationException("pipeline completed");
    }

    private async Task<DemoAction> NextActionAsync()
    {
        using var cts = new CancellationTokenSource(TimeSpan.FromSeconds(30));
        await foreach (var action in _actions.ReadAllAsync(cts.Token))
        {
            return action;
        }

        throw new InvalidOperationException("queue completed");
    }

    [Fact]
    public async Task PlaysRows_StampedWithDemoNow_AndLoopsWithTimeContinuingForward()
    {
        var health = new FeedHealthRegistry(_fake);
        using var simulator = Simulator(_fake, health);
        await simulator.StartAsync(CancellationToken.None);

        var rejected = await NextAsync();
        Assert.Empty(rejected.Readings);
        Assert.Equal("line 6: value 'abc' is not a finite number", Assert.Single(rejected.Rejections).Detail);

        var first = await NextAsync();
        Assert.Equal("demo", first.Source);
        Assert.Equal(
            [new Reading(s_start, "T1", ReadingKind.Rvr, 1500), new Reading(s_start, "C1", ReadingKind.CloudBase, 300)],
            first.Readings);

        _fake.Advance(TimeSpan.FromMinutes(1));
        var second = await NextAsync();
        Assert.Equal(new Reading(s_start.AddMinutes(1), "T1", ReadingKind.Rvr, 900), Assert.Single(second.Readings));
        Assert.Equal(new DemoAction(s_start.AddMinutes(1), "duty-demo", "confirm", "active", null, "invented: fog as forecast"), await NextActionAsync());

        _fake.Advance(TimeSpan.FromMinutes(1));
        var third = await NextAsync();
        Assert.Equal(new Reading(s_start.AddMinutes(2), "T1", ReadingKind.Rvr, 600, ReadingStatus.Failed), Assert.Single(third.Readings));

        // Scenario lasts 2 min, loop gap 1 min: the second loop starts at +3 min, not back at the start.
        _fake.Advance(TimeSpan.FromSeconds(59));
        Assert.False(_pipeline.TryRead(out _));
        _fake.Advance(TimeSpan.FromSeconds(1));
        var looped = await NextAsync();
        Assert.Equal(s_start.AddMinutes(3), looped.Readings[0].Time);
        Assert.Equal(2, looped.Readings.Count);

        Assert.Equal(FeedStatus.Ok, health.Get("demo")!.Status);
        await simulator.StopAsync(CancellationToken.None);
    }

    [Fact]
    public async Task WithSeveralNodes_OnlyTheLeaderPlays_AndANodeThatTakesOverGoesOnFromItsPlaceInTheSchedule()
    {
        // docs/deployment.md "The demo in the ha profile": a standby submits nothing (readings, rejections, actions) and shows no demo feed
        var health = new FeedHealthRegistry(_fake);
        var leadership = new OpsLvp.Web.Tests.Cluster.SwitchableLeadership("node-b", leader: false, epoch: 1);
        using var simulator = Simulator(_fake, health, leadership: leadership, engine: new EngineStateView()); // a standby runs no engine: no state, no wait
        await simulator.StartAsync(CancellationToken.None);
        await Infrastructure.Eventually.TrueAsync(() => simulator.SkippedGroups == 1, "the rows at 00:00 skipped");
        _fake.Advance(TimeSpan.FromMinutes(1));
        await Infrastructure.Eventually.TrueAsync(() => simulator.SkippedGroups == 2, "the rows and the action at 00:01 skipped");
        Assert.False(_pipeline.TryRead(out _));
        Assert.False(_actions.TryRead(out _));
        Assert.Null(health.Get("demo"));

        // this node takes over: the rows due from now on are played, stamped as the schedule has them
        leadership.Set(true, epoch: 2);
        _fake.Advance(TimeSpan.FromMinutes(1));
        var played = await NextAsync();
        Assert.Equal(new Reading(s_start.AddMinutes(2), "T1", ReadingKind.Rvr, 600, ReadingStatus.Failed), Assert.Single(played.Readings));
        Assert.Equal(FeedStatus.Ok, health.Get("demo")!.Status);
        Assert.Equal(2, simulator.SkippedGroups);

        // and a node that stops leading stops playing
        leadership.Set(false);
        _fake.Advance(TimeSpan.FromMinutes(1));
        await Infrastructure.Eventually.TrueAsync(() => simulator.SkippedGroups == 3, "the next loop's first rows skipped");
        Assert.False(_pipeline.TryRead(out _));
        await simulator.StopAsync(CancellationToken.None);
    }

    private sealed class EngineStateView : OpsLvp.Web.Engine.IEngineStateView
    {
        public OpsLvp.Core.Engine.EngineState? State { get; set; }

        public bool WillEvaluate { get; set; } = true;
    }

    /// <summary>The fake clock moved on in steps of the simulator's poll (50 ms of real time at x30) until a batch comes, or null after <paramref name="steps"/> steps.</summary>
    private async Task<ReadingBatch?> AdvanceUntilBatchAsync(int steps)
    {
        for (var i = 0; i < steps; i++)
        {
            await Task.Delay(20);
            if (_pipeline.TryRead(out var batch))
            {
                return batch;
            }
            _fake.Advance(TimeSpan.FromSeconds(1.5));
        }
        return null;
    }

    [Fact]
    public async Task OnALeadingNode_PlaysOnlyOnceTheEngineIsRestored_AndTheClockHasPassedWhatItHolds()
    {
        // docs/reliability.md "Demo on an existing data folder": a demo restarted on its own folder starts its clock
        // again from the real time; a reading stamped before what the restored engine holds would be refused as older
        // than the latest, so nothing is played before the engine has restored and the clock is past its state
        var engine = new EngineStateView();
        using var simulator = Simulator(_fake, new FeedHealthRegistry(_fake), engine: engine);
        await simulator.StartAsync(CancellationToken.None);
        Assert.Null(await AdvanceUntilBatchAsync(10)); // not restored yet

        // restored with its evaluation time and a latest reading 6 s ahead of the clock (inside the engine's tolerance,
        // so no clock regression rebases it): nothing is played until the clock has passed both
        var restoredAt = _fake.GetUtcNow().AddSeconds(6);
        var latest = new Reading(restoredAt, "T1", ReadingKind.Rvr, 1200);
        engine.State = new OpsLvp.Core.Engine.EngineState
        {
            EvaluatedAt = restoredAt.AddSeconds(-1),
            PhaseSince = restoredAt.AddHours(-1),
            Latest = System.Collections.Immutable.ImmutableDictionary<string, Reading>.Empty.Add(OpsLvp.Core.Engine.EngineState.SensorKey("T1", ReadingKind.Rvr), latest),
        };
        Assert.Null(await AdvanceUntilBatchAsync(2)); // 3 s of the 6
        var rejected = await AdvanceUntilBatchAsync(40);
        Assert.NotNull(rejected);
        Assert.Empty(rejected.Readings);
        var first = await NextAsync();
        Assert.All(first.Readings, r => Assert.True(r.Time >= restoredAt, $"{r.SensorId} stamped {r.Time:o}, before the engine's latest reading at {restoredAt:o}"));
        await simulator.StopAsync(CancellationToken.None);
    }

    [Fact]
    public async Task AfterAClockRegression_TheEnginesRebasedState_LetsItPlayAtOnce()
    {
        // the engine's first evaluation found its restored time minutes ahead and rebased at the clock's now
        // (docs/reliability.md "Clock regression"): the simulator does not wait for the clock to reach the old time
        var engine = new EngineStateView();
        using var simulator = Simulator(_fake, new FeedHealthRegistry(_fake), engine: engine);
        var ahead = _fake.GetUtcNow().AddMinutes(10);
        engine.State = new OpsLvp.Core.Engine.EngineState { EvaluatedAt = ahead, PhaseSince = ahead };
        await simulator.StartAsync(CancellationToken.None);
        Assert.Null(await AdvanceUntilBatchAsync(10));

        var now = _fake.GetUtcNow();
        engine.State = engine.State with { EvaluatedAt = now, MonitoringSince = now };
        var rejected = await AdvanceUntilBatchAsync(5);
        Assert.NotNull(rejected);
        var first = await NextAsync();
        Assert.InRange(first.Readings[0].Time, now, now.AddSeconds(10));
        await simulator.StopAsync(CancellationToken.None);
    }

    [Fact]
    public async Task WithAnEngineThatWillNotEvaluate_PlaysWithoutWaiting()
    {
        // Engine:Enabled=false, or an engine stopped on a state mismatch: no state will come, so there is nothing to wait for
        using var simulator = Simulator(_fake, new FeedHealthRegistry(_fake), engine: new EngineStateView { WillEvaluate = false });
        await simulator.StartAsync(CancellationToken.None);
        Assert.Empty((await NextAsync()).Readings); // the scenario's rejected row
        Assert.Equal(s_start, (await NextAsync()).Readings[0].Time);
        await simulator.StopAsync(CancellationToken.None);
    }

    [Fact]
    public async Task OnAcceleratedClock_OneDemoMinuteTakesTwoRealSeconds()
    {
        var real = new FakeTimeProvider(new DateTimeOffset(2030, 6, 1, 12, 0, 0, TimeSpan.Zero));
        var demoClock = new AcceleratedTimeProvider(real, s_start, 30);
        using var simulator = Simulator(demoClock, new FeedHealthRegistry(demoClock));
        await simulator.StartAsync(CancellationToken.None);
        await NextAsync();
        var first = await NextAsync();
        Assert.Equal(s_start, first.Readings[0].Time);

        real.Advance(TimeSpan.FromSeconds(2));
        var second = await NextAsync();

        Assert.Equal(s_start.AddMinutes(1), second.Readings[0].Time);
        await simulator.StopAsync(CancellationToken.None);
    }

    [Fact]
    public async Task MissingScenarioFile_IsHealthDown_NotACrash()
    {
        var health = new FeedHealthRegistry(_fake);
        using var simulator = Simulator(_fake, health, scenario: "missing.csv");

        await simulator.StartAsync(CancellationToken.None);
        await simulator.ExecuteTask!.WaitAsync(TimeSpan.FromSeconds(30));

        var entry = health.Get("demo")!;
        Assert.Equal(FeedStatus.Down, entry.Status);
        Assert.StartsWith("cannot read Demo:ScenarioPath", entry.LastError, StringComparison.Ordinal);
        Assert.Contains("missing.csv", entry.LastError, StringComparison.Ordinal);
        Assert.True(simulator.ExecuteTask.IsCompletedSuccessfully);
    }

    [Fact]
    public async Task NotInDemoMode_PlaysNothing_AndIsNotListed()
    {
        var health = new FeedHealthRegistry(_fake);
        using var simulator = Simulator(_fake, health, demo: false);

        await simulator.StartAsync(CancellationToken.None);
        await simulator.ExecuteTask!.WaitAsync(TimeSpan.FromSeconds(30));

        Assert.False(_pipeline.TryRead(out _));
        Assert.Null(health.Get("demo"));
    }
}
