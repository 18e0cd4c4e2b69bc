using Microsoft.Extensions.Options;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Feeds.Demo;

/// <summary>
/// Plays the demo scenario on the app clock while demo mode is on (<see cref="DemoMode"/>): each group of
/// rows with the same offset becomes one <see cref="ReadingBatch"/> stamped with the demo time it plays at
/// (clock at start + offset), actions go to the <see cref="DemoActionQueue"/>. At the end it loops after
/// <c>Demo:LoopGap</c>, time continuing forward. A missing or broken scenario is logged and shown as health
/// <c>down</c>; it never stops the server.
/// <para>With several nodes only the node that leads plays (docs/deployment.md "The demo in the ha profile"): every
/// node keeps the scenario's schedule from its own start, but a node that does not lead submits nothing (no readings,
/// forecasts or demo actions, which would otherwise be forwarded to the leader a second time) and shows no <c>demo</c>
/// feed; the node that takes over goes on from its place in the schedule. On one node it always leads.</para>
/// <para>On a node that leads, playing starts only once the engine has restored its state and the clock has passed
/// everything that state holds (its evaluation time and latest readings, <see cref="WaitForEngineAsync"/>): a demo
/// restarted on its own data folder starts its accelerated clock again from the real time, and a reading stamped before
/// what the engine already holds would be refused as older than the latest (docs/reliability.md "Demo on an existing
/// data folder").</para>
/// </summary>
public sealed class DemoSimulator(
    IOptions<DemoOptions> options,
    DemoMode demoMode,
    ContentPaths paths,
    ReadingPipeline pipeline,
    DemoActionQueue actions,
    FeedHealthRegistry health,
    TimeProvider clock,
    ILogger<DemoSimulator> logger,
    OpsLvp.Web.Cluster.ILeadership? leadership = null,
    OpsLvp.Web.Engine.IEngineStateView? engine = null) : BackgroundService
{
    private long _skipped;
    private bool _registered;
    private bool? _wasLeading;

    /// <summary>Groups of rows due while this node did not lead, so not submitted.</summary>
    public long SkippedGroups => Interlocked.Read(ref _skipped);

    /// <summary>Health and batch source name of the simulator.</summary>
    public const string SourceName = "demo";

    /// <summary>Shortest loop period, so a one-row scenario with no gap cannot spin.</summary>
    public static readonly TimeSpan MinLoopPeriod = TimeSpan.FromSeconds(1);

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        if (!demoMode.Enabled)
        {
            return;
        }

        await Task.Yield();
        if (leadership is OpsLvp.Web.Cluster.ILeadershipElection && demoMode.Speed != 1)
        {
            logger.LogWarning("Demo:Speed is {Speed} on a node of several: each node's demo clock starts at its own start, so a takeover sees another time; set Demo:Speed to 1 on every node (docs/deployment.md \"The demo in the ha profile\")", demoMode.Speed);
        }
        _ = Leading();
        var scenario = Load();
        if (scenario is null)
        {
            return;
        }

        await WaitForEngineAsync(stoppingToken);
        var origin = clock.GetUtcNow();
        if (scenario.Rejections.Count > 0 && Leading())
        {
            await pipeline.SubmitAsync(new ReadingBatch(SourceName, origin, [], scenario.Rejections), stoppingToken);
        }

        var period = scenario.Duration + options.Value.LoopGap;
        if (period < MinLoopPeriod)
        {
            period = MinLoopPeriod;
        }

        try
        {
            for (var loop = 0L; !stoppingToken.IsCancellationRequested; loop++)
            {
                await PlayOnceAsync(scenario, origin + period * loop, stoppingToken);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private async Task PlayOnceAsync(Scenario scenario, DateTimeOffset loopStart, CancellationToken stoppingToken)
    {
        var r = 0;
        var a = 0;
        var f = 0;
        while (r < scenario.Readings.Count || a < scenario.Actions.Count || f < scenario.Forecasts.Count)
        {
            var nextReading = r < scenario.Readings.Count ? scenario.Readings[r].Offset : TimeSpan.MaxValue;
            var nextAction = a < scenario.Actions.Count ? scenario.Actions[a].Offset : TimeSpan.MaxValue;
            var nextForecast = f < scenario.Forecasts.Count ? scenario.Forecasts[f].Offset : TimeSpan.MaxValue;
            var offset = nextReading <= nextAction ? nextReading : nextAction;
            offset = nextForecast < offset ? nextForecast : offset;
            var due = loopStart + offset;
            await WaitUntilAsync(due, stoppingToken);
            var leading = Leading();

            var group = new List<OpsLvp.Core.Readings.Reading>();
            while (r < scenario.Readings.Count && scenario.Readings[r].Offset == offset)
            {
                group.Add(scenario.Readings[r++].At(due));
            }

            if (!leading)
            {
                Interlocked.Increment(ref _skipped);
                while (a < scenario.Actions.Count && scenario.Actions[a].Offset == offset)
                {
                    a++;
                }
                while (f < scenario.Forecasts.Count && scenario.Forecasts[f].Offset == offset)
                {
                    f++;
                }
                continue;
            }

            if (group.Count > 0)
            {
                await pipeline.SubmitAsync(new ReadingBatch(SourceName, clock.GetUtcNow(), group, []), stoppingToken);
                health.RecordSuccess(SourceName, group.Count, 0);
            }

            while (a < scenario.Actions.Count && scenario.Actions[a].Offset == offset)
            {
                await actions.SubmitAsync(scenario.Actions[a++].At(due), stoppingToken);
            }

            var forecasts = new List<OpsLvp.Core.Engine.ForecastInput>();
            while (f < scenario.Forecasts.Count && scenario.Forecasts[f].Offset == offset)
            {
                var forecast = scenario.Forecasts[f++].Forecast;
                var shift = scenario.Origin is { } origin ? loopStart - origin : TimeSpan.Zero;
                forecasts.Add(forecast with { Text = DemoForecastShift.Shift(forecast.Text, forecast.ReceivedAt, shift), ReceivedAt = due });
            }
            if (forecasts.Count > 0)
            {
                await pipeline.SubmitAsync(new ReadingBatch(SourceName, clock.GetUtcNow(), [], []) { Forecasts = forecasts }, stoppingToken);
            }
        }
    }

    /// <summary>
    /// On a node that leads, until its engine has restored a state and the clock is past that state's evaluation time
    /// and latest readings. After a clock regression the engine's first evaluation rebases its state at the clock's
    /// now (docs/reliability.md "Clock regression"), which ends the wait at once; without one the wait is at most the
    /// few seconds of tolerance. A node that does not lead (it plays nothing), a node whose engine will not evaluate
    /// (disabled, or stopped) and a simulator without an engine do not wait.
    /// </summary>
    private async Task WaitForEngineAsync(CancellationToken stoppingToken)
    {
        if (engine is null)
        {
            return;
        }
        var poll = TimeSpan.FromMilliseconds(50) * demoMode.Speed; // 50 ms of real time on the accelerated clock
        var logged = false;
        while (Leading() && engine.WillEvaluate && !EngineBehindClock(engine.State, clock.GetUtcNow()))
        {
            if (!logged)
            {
                logger.LogInformation("Demo simulator: waiting for the engine to restore its state and for the clock to pass it before playing");
                logged = true;
            }
            await Task.Delay(poll, clock, stoppingToken);
        }
    }

    /// <summary>True when <paramref name="state"/> is restored and nothing in it is later than <paramref name="now"/>.</summary>
    internal static bool EngineBehindClock(OpsLvp.Core.Engine.EngineState? state, DateTimeOffset now) =>
        state is not null && state.EvaluatedAt <= now && state.Latest.Values.All(r => r.Time <= now);

    private async Task WaitUntilAsync(DateTimeOffset due, CancellationToken stoppingToken)
    {
        // Timers may fire a little early against the clock; never stamp a reading ahead of "now".
        TimeSpan wait;
        while ((wait = due - clock.GetUtcNow()) > TimeSpan.Zero)
        {
            await Task.Delay(wait, clock, stoppingToken);
        }
    }

    private Scenario? Load()
    {
        var demo = options.Value;
        var readingsPath = paths.Resolve(demo.ScenarioPath);
        string readingsCsv;
        try
        {
            readingsCsv = File.ReadAllText(readingsPath);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            Fail($"cannot read Demo:ScenarioPath '{readingsPath}': {ex.Message}");
            return null;
        }

        string? actionsCsv = null;
        if (!string.IsNullOrWhiteSpace(demo.ActionsPath))
        {
            var actionsPath = paths.Resolve(demo.ActionsPath);
            if (File.Exists(actionsPath))
            {
                try
                {
                    actionsCsv = File.ReadAllText(actionsPath);
                }
                catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
                {
                    logger.LogWarning("Demo:ActionsPath '{Path}' cannot be read, playing readings only: {Error}", actionsPath, ex.Message);
                }
            }
            else
            {
                logger.LogInformation("Demo:ActionsPath '{Path}' not found; playing readings only", actionsPath);
            }
        }

        Scenario scenario;
        try
        {
            scenario = ScenarioCsv.Load(readingsCsv, actionsCsv);
        }
        catch (FeedFormatException ex)
        {
            Fail($"Demo:ScenarioPath '{readingsPath}': {ex.Message}");
            return null;
        }

        foreach (var rejection in scenario.Rejections)
        {
            logger.LogWarning("Demo scenario row skipped: {Detail}", rejection.Detail);
        }

        foreach (var error in scenario.ActionErrors)
        {
            logger.LogWarning("Demo action row skipped: {Detail}", error);
        }

        if (scenario.Readings.Count == 0)
        {
            Fail($"Demo:ScenarioPath '{readingsPath}' has no valid reading rows");
            return null;
        }

        if (!string.IsNullOrWhiteSpace(demo.ForecastsPath) && scenario.Origin is { } scenarioOrigin)
        {
            var forecastsPath = paths.Resolve(demo.ForecastsPath);
            if (File.Exists(forecastsPath))
            {
                try
                {
                    scenario = scenario with
                    {
                        Forecasts = OpsLvp.Core.Engine.Replay.ForecastsCsv.Parse(File.ReadAllText(forecastsPath), forecastsPath)
                            .Select(x => (x.ReceivedAt - scenarioOrigin, x))
                            .Where(x => x.Item1 >= TimeSpan.Zero)
                            .OrderBy(x => x.Item1)
                            .ToList(),
                    };
                }
                catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or FormatException)
                {
                    logger.LogWarning("Demo:ForecastsPath '{Path}' cannot be used, playing without forecasts: {Error}", forecastsPath, ex.Message);
                }
            }
        }

        logger.LogInformation("Demo simulator: {Readings} readings, {Actions} actions over {Duration} of demo time at x{Speed}",
            scenario.Readings.Count, scenario.Actions.Count, scenario.Duration, demoMode.Speed);
        return scenario;
    }

    /// <summary>Whether this node plays now; logs each change and registers the <c>demo</c> feed the first time it leads.</summary>
    private bool Leading()
    {
        var leading = leadership?.IsLeader ?? true;
        if (_wasLeading != leading)
        {
            if (_wasLeading is not null || !leading)
            {
                logger.LogInformation(leading
                    ? "Demo simulator: this node leads; it plays the demo scenario from here"
                    : "Demo simulator: this node does not lead; the leader plays the demo scenario");
            }
            _wasLeading = leading;
        }
        if (leading && !_registered)
        {
            health.Register(SourceName, "simulator");
            _registered = true;
        }
        return leading;
    }

    private void Fail(string error)
    {
        health.RecordFailure(SourceName, error);
        logger.LogError("Demo simulator not running: {Error}", error);
    }
}
