using Microsoft.Extensions.DependencyInjection.Extensions;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Hosting;
using Microsoft.AspNetCore.SignalR;
using Microsoft.AspNetCore.SignalR.StackExchangeRedis;
using Microsoft.Extensions.Options;
using StackExchange.Redis;

namespace OpsLvp.Web.Cluster;

public static class ClusterServiceCollectionExtensions
{
    /// <summary>
    /// With <c>Cluster:Redis</c> set: the SignalR Redis backplane, snapshot fan-out and command forwarding
    /// (docs/deployment.md "Fan-out and commands between nodes"). Without it everything behaves as on one node. A malformed setting stops
    /// the start naming it; an unreachable Redis does not (the node runs and says it cannot fan out). Call after
    /// <c>AddLiveEngine</c>.
    /// </summary>
    public static IServiceCollection AddCluster(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<FanoutOptions>()
            .Bind(configuration.GetSection(ClusterOptions.SectionName))
            .ValidateShape(configuration, ClusterOptions.SectionName)
            .Validate(o => ParseError(o.Redis) is null, "Cluster:Redis is not a valid StackExchange.Redis configuration string (e.g. redis:6379,password=...).")
            .Validate(o => !string.IsNullOrWhiteSpace(o.RedisPrefix) && !o.RedisPrefix.Contains(' ', StringComparison.Ordinal), "Cluster:RedisPrefix must be a non-empty word.")
            .Validate(o => o.LeaderSilence >= TimeSpan.FromSeconds(0.1) && o.LeaderSilence <= TimeSpan.FromMinutes(10), "Cluster:LeaderSilence must be between 00:00:00.1 and 00:10:00.")
            .Validate(o => o.CommandTimeout >= TimeSpan.FromSeconds(0.1) && o.CommandTimeout <= TimeSpan.FromMinutes(5), "Cluster:CommandTimeout must be between 00:00:00.1 and 00:05:00.")
            .ValidateOnStart();
        // Cluster:Redis is known only once the app is built (settings may come late), so everything is registered and
        // each part chooses at start: with the setting the Redis backplane and fan-out, without it today's behaviour.
        services.AddOptions<RedisOptions>().Configure<IOptions<FanoutOptions>>((o, fanout) =>
        {
            if (fanout.Value.Enabled)
            {
                o.Configuration = RedisLink.Configure(fanout.Value.Redis);
                o.Configuration.ChannelPrefix = RedisChannel.Literal(fanout.Value.RedisPrefix + ":hub");
            }
        });
        services.Replace(ServiceDescriptor.Singleton(typeof(HubLifetimeManager<>), typeof(ClusterHubLifetimeManager<>)));
        services.AddSingleton<RedisLink>();
        services.AddHostedService(sp => sp.GetRequiredService<RedisLink>());
        services.AddSingleton<SnapshotFanout>();
        services.AddHostedService(sp => sp.GetRequiredService<SnapshotFanout>());
        services.AddSingleton<ClusterSeal>();
        services.AddSingleton<CommandForwarding>();
        services.AddHostedService(sp => sp.GetRequiredService<CommandForwarding>());
        services.TryAddSingleton<LvpCommandService>();
        services.Replace(ServiceDescriptor.Singleton<ILvpCommandService, ClusterCommandService>());
        return services;
    }

    /// <summary>Null when <paramref name="configuration"/> is empty or parses; else why not.</summary>
    public static string? ParseError(string? configuration)
    {
        if (string.IsNullOrWhiteSpace(configuration))
        {
            return null;
        }
        try
        {
            _ = ConfigurationOptions.Parse(configuration);
            return null;
        }
        catch (ArgumentException ex)
        {
            return ex.Message;
        }
    }
}
