using Microsoft.Extensions.FileProviders;
using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Hosting;

public static class HostingServiceCollectionExtensions
{
    /// <summary>Request path of the app's own assets (<c>wwwroot-assets/</c>).</summary>
    public const string AssetsRequestPath = "/assets";

    /// <summary>Registers <see cref="ContentPaths"/>, <see cref="StorageOptions"/>, <see cref="AssetsOptions"/> and <see cref="AppPaths"/>.</summary>
    public static IServiceCollection AddAppPaths(this IServiceCollection services, IConfiguration configuration, IWebHostEnvironment environment)
    {
        services.AddSingleton(new ContentPaths(environment.ContentRootPath));
        services.AddOptions<StorageOptions>()
            .Bind(configuration.GetSection(StorageOptions.SectionName))
            .ValidateShape(configuration, StorageOptions.SectionName)
            .Validate(o => !string.IsNullOrWhiteSpace(o.DataFolder), "Storage:DataFolder must be set.")
            .Validate(o => o.DataFolder.IndexOfAny(Path.GetInvalidPathChars()) < 0, "Storage:DataFolder is not a valid path.")
            .ValidateOnStart();
        services.AddOptions<AssetsOptions>()
            .Bind(configuration.GetSection(AssetsOptions.SectionName))
            .ValidateShape(configuration, AssetsOptions.SectionName)
            .Validate(o => !string.IsNullOrWhiteSpace(o.Folder), "Assets:Folder must be set.")
            .ValidateOnStart();
        services.AddSingleton(sp =>
        {
            var paths = sp.GetRequiredService<ContentPaths>();
            var storage = sp.GetRequiredService<IOptions<StorageOptions>>().Value;
            var data = Path.GetFullPath(Path.Combine(paths.ContentRoot, storage.DataFolder));
            Directory.CreateDirectory(data);
            var assets = paths.Resolve(sp.GetRequiredService<IOptions<AssetsOptions>>().Value.Folder);
            if (!Directory.Exists(assets))
            {
                throw new OptionsValidationException(AssetsOptions.SectionName, typeof(AssetsOptions),
                    [$"Assets:Folder '{assets}' does not exist."]);
            }

            return new AppPaths(data, assets);
        });
        return services;
    }

    /// <summary>Serves <see cref="AppPaths.AssetsFolder"/> under <see cref="AssetsRequestPath"/>.</summary>
    public static WebApplication UseAppAssets(this WebApplication app)
    {
        var paths = app.Services.GetRequiredService<AppPaths>();
        app.UseStaticFiles(new StaticFileOptions
        {
            FileProvider = new PhysicalFileProvider(paths.AssetsFolder),
            RequestPath = AssetsRequestPath,
        });
        return app;
    }
}
