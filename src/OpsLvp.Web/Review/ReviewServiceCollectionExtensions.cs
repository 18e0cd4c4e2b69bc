using Microsoft.Extensions.DependencyInjection.Extensions;

namespace OpsLvp.Web.Review;

public static class ReviewServiceCollectionExtensions
{
    /// <summary>Registers <see cref="ReviewService"/> and, unless one is registered already, the database <see cref="IEpisodeSource"/>.</summary>
    public static IServiceCollection AddReview(this IServiceCollection services)
    {
        services.TryAddSingleton<IEpisodeSource, StoreEpisodeSource>();
        services.AddSingleton<ReviewService>();
        return services;
    }
}
