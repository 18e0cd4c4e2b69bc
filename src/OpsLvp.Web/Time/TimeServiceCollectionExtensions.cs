using Microsoft.Extensions.DependencyInjection.Extensions;
using Microsoft.Extensions.Options;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Hosting;

namespace OpsLvp.Web.Time;

public static class TimeServiceCollectionExtensions
{
    /// <summary>Key of the real-time clock used for network timing (poll interval, timeout, back-off), never accelerated.</summary>
    public const string NetworkClockKey = "network";

    /// <summary>
    /// Registers <see cref="DemoOptions"/>, <see cref="DemoMode"/> and the app clock: an
    /// <see cref="AcceleratedTimeProvider"/> over the system clock in demo mode, <see cref="TimeProvider.System"/> otherwise.
    /// </summary>
    public static IServiceCollection AddAppClock(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<DemoOptions>()
            .Bind(configuration.GetSection(DemoOptions.SectionName))
            .ValidateShape(configuration, DemoOptions.SectionName)
            .Validate(o => double.IsFinite(o.Speed) && o.Speed >= 1 && o.Speed <= AcceleratedTimeProvider.MaxSpeed,
                $"Demo:Speed must be between 1 and {AcceleratedTimeProvider.MaxSpeed}.")
            .Validate(o => o.LoopGap >= TimeSpan.Zero && o.LoopGap <= TimeSpan.FromDays(1),
                "Demo:LoopGap must be between 00:00:00 and 1.00:00:00.")
            .Validate(o => o.Simulator == SimulatorMode.Off || !string.IsNullOrWhiteSpace(o.ScenarioPath),
                "Demo:ScenarioPath must be set when the simulator may run (Demo:Simulator is Auto or On).")
            .ValidateOnStart();

        services.TryAddSingleton(sp => Decide(
            sp.GetRequiredService<IOptions<DemoOptions>>().Value,
            sp.GetRequiredService<IOptions<FeedsOptions>>().Value));

        services.RemoveAll<TimeProvider>();
        services.AddSingleton(sp =>
        {
            var mode = sp.GetRequiredService<DemoMode>();
            if (!mode.Enabled)
            {
                return TimeProvider.System;
            }

            var options = sp.GetRequiredService<IOptions<DemoOptions>>().Value;
            return (TimeProvider)new AcceleratedTimeProvider(TimeProvider.System, options.Start ?? TimeProvider.System.GetUtcNow(), options.Speed);
        });
        services.AddKeyedSingleton(NetworkClockKey, TimeProvider.System);
        return services;
    }

    /// <summary>Demo mode is on when the simulator is forced on, or in Auto when no real feed is configured.</summary>
    public static DemoMode Decide(DemoOptions demo, FeedsOptions feeds)
    {
        var enabled = demo.Simulator switch
        {
            SimulatorMode.On => true,
            SimulatorMode.Off => false,
            _ => feeds.Http.Count == 0 && feeds.Metar.Count == 0 && feeds.Push.ApiKeys.Count == 0,
        };
        return new DemoMode(enabled, demo.Speed);
    }
}
