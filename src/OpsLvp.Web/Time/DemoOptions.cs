namespace OpsLvp.Web.Time;

/// <summary>Configuration section <c>Demo</c>: the demo simulator and its accelerated clock (docs/feeds.md).</summary>
public sealed class DemoOptions
{
    public const string SectionName = "Demo";

    public SimulatorMode Simulator { get; set; } = SimulatorMode.Auto;

    /// <summary>Simulated seconds per real second while in demo mode, 1 to <see cref="AcceleratedTimeProvider.MaxSpeed"/>.</summary>
    public double Speed { get; set; } = 60;

    /// <summary>Simulated UTC at app start; unset = the real time at start.</summary>
    public DateTimeOffset? Start { get; set; }

    /// <summary>Readings CSV (<c>time,sensor,kind,value,status</c>); relative paths are looked up from the content root upwards.</summary>
    public string ScenarioPath { get; set; } = "seed-demo/scenarios/demo-night.csv";

    /// <summary>Optional demo actions CSV (<c>time,actor,action,target,value,reason</c>); empty = none; a missing file is skipped.</summary>
    public string? ActionsPath { get; set; } = "seed-demo/scenarios/demo-night.actions.csv";

    /// <summary>
    /// Optional demo forecasts CSV (<c>time,origin,text</c>, docs/replay.md "Forecasts"), played with the readings: each
    /// report's times are moved by the same shift as the readings (docs/feeds.md "Demo forecasts"); empty = none; a
    /// missing file is skipped.
    /// </summary>
    public string? ForecastsPath { get; set; } = "seed-demo/scenarios/demo-night.forecasts.csv";

    /// <summary>Simulated time between the last row of one loop and the first row of the next.</summary>
    public TimeSpan LoopGap { get; set; } = TimeSpan.FromMinutes(1);
}
