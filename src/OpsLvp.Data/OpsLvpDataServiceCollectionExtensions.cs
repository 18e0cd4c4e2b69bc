using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;

namespace OpsLvp.Data;

public static class OpsLvpDataServiceCollectionExtensions
{
    /// <summary>
    /// Registers the context factory and the stores (singletons; the audit store's write lock is per instance) from
    /// <c>OpsLvp:Database:*</c>. The settings are read when the first context is made, so a bad value fails at start
    /// once the host calls <see cref="DatabaseStartup.MigrateAndCheckAsync"/>.
    /// </summary>
    public static IServiceCollection AddOpsLvpData(this IServiceCollection services, IConfiguration configuration, string? defaultConnectionString = null)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        services.AddDbContextFactory<OpsLvpDbContext>(b => OpsLvpDatabase.Configure(b, configuration, defaultConnectionString));
        services.AddSingleton<ReadingStore>();
        services.AddSingleton<ReadingInboxStore>();
        services.AddSingleton<AuditStore>();
        services.AddSingleton<FeedHealthStore>();
        services.AddSingleton<DisplayTokenStore>();
        services.AddSingleton<ApiKeyStore>();
        return services;
    }

    /// <summary>
    /// As above, with the default connection string worked out when the first context is made (e.g. from a data
    /// folder that is only known once configuration is complete).
    /// </summary>
    public static IServiceCollection AddOpsLvpData(this IServiceCollection services, IConfiguration configuration, Func<IServiceProvider, string?> defaultConnectionString)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        ArgumentNullException.ThrowIfNull(defaultConnectionString);
        services.AddDbContextFactory<OpsLvpDbContext>((sp, b) => OpsLvpDatabase.Configure(b, configuration, defaultConnectionString(sp)));
        services.AddSingleton<ReadingStore>();
        services.AddSingleton<ReadingInboxStore>();
        services.AddSingleton<AuditStore>();
        services.AddSingleton<FeedHealthStore>();
        services.AddSingleton<DisplayTokenStore>();
        services.AddSingleton<ApiKeyStore>();
        return services;
    }
}
