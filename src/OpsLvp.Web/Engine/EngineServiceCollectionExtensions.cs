using Microsoft.Extensions.DependencyInjection.Extensions;
using OpsLvp.Data;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Engine;

public static class EngineServiceCollectionExtensions
{
    /// <summary>File name of the SQLite database in the data folder when no connection string is configured.</summary>
    public const string DatabaseFileName = "opslvp.db";

    /// <summary>
    /// Registers the database (default: SQLite file in <c>Storage:DataFolder</c>), <see cref="EngineOptions"/>, the
    /// <see cref="LiveEngineHost"/>, <see cref="LiveState"/>, the hub and its broadcaster, the command service and the
    /// demo action runner. Needs <c>AddAppPaths</c>, <c>AddAppClock</c> and <c>AddFeeds</c>.
    /// </summary>
    public static IServiceCollection AddLiveEngine(this IServiceCollection services, IConfiguration configuration)
    {
        // resolved when first needed: configuration is complete only once the app is built
        services.AddOpsLvpData(configuration, sp => $"Data Source={Path.Combine(sp.GetRequiredService<AppPaths>().DataFolder, DatabaseFileName)}");
        services.AddOptions<EngineOptions>()
            .Bind(configuration.GetSection(EngineOptions.SectionName))
            .ValidateShape(configuration, EngineOptions.SectionName)
            .Validate(o => !string.IsNullOrWhiteSpace(o.ProfilePath), "Engine:ProfilePath must be set.")
            .Validate(o => o.TickInterval > TimeSpan.Zero && o.TickInterval <= TimeSpan.FromSeconds(1), "Engine:TickInterval must be between 00:00:00.001 and 00:00:01.")
            .Validate(o => o.StateFlushInterval > TimeSpan.Zero && o.StateFlushInterval <= TimeSpan.FromMinutes(5), "Engine:StateFlushInterval must be between 00:00:00.001 and 00:05:00.")
            .Validate(o => o.ReadingsCoverInterval >= TimeSpan.FromSeconds(1) && o.ReadingsCoverInterval <= TimeSpan.FromHours(24), "Engine:ReadingsCoverInterval must be between 00:00:01 and 1.00:00:00 (how long readings may stay without a covering audit entry, docs/audit.md \"Readings covered\").")
            .ValidateOnStart();
        services.AddOptions<LiveOptions>()
            .Bind(configuration.GetSection(LiveOptions.SectionName))
            .ValidateShape(configuration, LiveOptions.SectionName)
            .Validate(o => o.MaxStatesPerSecond is >= 0.01 and <= 1000, "Live:MaxStatesPerSecond must be between 0.01 and 1000.")
            .ValidateOnStart();
        services.AddOptions<ClusterOptions>()
            .Bind(configuration.GetSection(ClusterOptions.SectionName))
            .ValidateShape(configuration, ClusterOptions.SectionName)
            .Validate(o => o.LeaderRetryInterval >= TimeSpan.FromMilliseconds(100) && o.LeaderRetryInterval <= TimeSpan.FromSeconds(10), "Cluster:LeaderRetryInterval must be between 00:00:00.1 and 00:00:10.")
            .Validate(o => o.InboxPollInterval >= TimeSpan.FromMilliseconds(100) && o.InboxPollInterval <= TimeSpan.FromMinutes(1), "Cluster:InboxPollInterval must be between 00:00:00.1 and 00:01:00.")
            .Validate(o => o.InboxMaxBatches is >= 1 and <= 1_000_000, "Cluster:InboxMaxBatches must be between 1 and 1000000 (the most reading batches the inbox holds).")
            .Validate(o => o.InboxAlarmAfter >= TimeSpan.FromSeconds(1) && o.InboxAlarmAfter <= TimeSpan.FromHours(1), "Cluster:InboxAlarmAfter must be between 00:00:01 and 01:00:00 (how long a batch may wait in the reading inbox before the screens say so).")
            .Validate(o => o.InboxSetAsideAfter is >= 1 and <= 100, "Cluster:InboxSetAsideAfter must be between 1 and 100 (attempts at a failing inbox batch before it is set aside).")
            .ValidateOnStart();
        // several nodes elect the engine's leader on PostgreSQL; the embedded SQLite file has one node, always leading
        services.AddSingleton<PostgresLeadership>();
        services.TryAddSingleton<ILeadership>(sp => OpsLvpDatabase.IsPostgres(configuration[OpsLvpDatabase.ProviderSetting])
            ? sp.GetRequiredService<PostgresLeadership>()
            : ActivatorUtilities.CreateInstance<SingleNodeLeadership>(sp));
        services.AddSingleton<LiveState>();
        services.AddSingleton<ILiveState>(sp => sp.GetRequiredService<LiveState>());
        services.TryAddSingleton<OpsLvp.Web.Retention.RetentionAlarm>();
        services.TryAddSingleton<InboxAlarms>();
        services.TryAddSingleton<InboxLimit>();
        services.AddSingleton<LiveEngineHost>();
        services.AddHostedService(sp => sp.GetRequiredService<LiveEngineHost>());
        services.AddSingleton<IEngineStateView>(sp => sp.GetRequiredService<LiveEngineHost>());
        // after the engine host, which has loaded the profile by the time this starts (PostgreSQL only; idle on SQLite)
        services.AddSingleton<ReadingInboxDrain>();
        services.AddHostedService(sp => sp.GetRequiredService<ReadingInboxDrain>());
        services.AddSingleton<ILvpCommandService, LvpCommandService>();
        services.AddSingleton<ICommandPreview, EngineCommandPreview>();
        services.AddHostedService<DemoActionRunner>();
        services.AddSignalR().AddJsonProtocol(o => LiveJson.Configure(o.PayloadSerializerOptions));
        services.AddHostedService<HubBroadcaster>();
        return services;
    }
}
