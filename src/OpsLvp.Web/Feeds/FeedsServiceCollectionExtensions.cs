using Microsoft.Extensions.Options;
using OpsLvp.Web.Feeds.Demo;
using OpsLvp.Web.Hosting;

namespace OpsLvp.Web.Feeds;

public static class FeedsServiceCollectionExtensions
{
    /// <summary>
    /// Registers <see cref="FeedsOptions"/> (validated at start), the <see cref="ReadingPipeline"/>, the
    /// <see cref="FeedHealthRegistry"/>, the HTTP poller, the demo simulator and its <see cref="DemoActionQueue"/>.
    /// Needs <c>AddAppClock</c> and <c>AddAppPaths</c>.
    /// </summary>
    public static IServiceCollection AddFeeds(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<FeedsOptions>()
            .Bind(configuration.GetSection(FeedsOptions.SectionName))
            .ValidateShape(configuration, FeedsOptions.SectionName)
            .ValidateOnStart();
        services.AddSingleton<IValidateOptions<FeedsOptions>, FeedsOptionsValidator>();

        services.AddSingleton<ReadingPipeline>();
        services.AddSingleton<FeedHealthRegistry>();
        services.AddSingleton<DemoActionQueue>();
        services.AddHttpClient(HttpFeedPoller.HttpClientName);
        services.AddHostedService<PushHealthRegistration>();
        services.AddHostedService<HttpFeedPoller>();
        services.AddHostedService<MetarFeedPoller>();
        services.AddHostedService<TafFeedPoller>();
        services.AddHostedService<DemoSimulator>();
        return services;
    }
}
