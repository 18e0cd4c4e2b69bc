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
/// </summary>
public sealed class DemoSimulator(
    IOptions<DemoOptions> options,
    DemoMode demoMode,
    ContentPaths paths,
    ReadingPipeline pipeline,
    DemoActionQueue actions,
    FeedHealthRegistry health,
    TimeProvider clock,
    ILogger<DemoSimulator> logger) : BackgroundService
{
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
        health.Register(SourceName, "simulator");
        var scenario = Load();
        if (scenario is null)
        {
            return;
        }

        var origin = clock.GetUtcNow();
        if (scenario.Rejections.Count > 0)
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

            var group = new List<OpsLvp.Core.Readings.Reading>();
            while (r < scenario.Readings.Count && scenario.Readings[r].Offset == offset)
            {
                group.Add(scenario.Readings[r++].At(due));
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

    private void Fail(string error)
    {
        health.RecordFailure(SourceName, error);
        logger.LogError("Demo simulator not running: {Error}", error);
    }
}
