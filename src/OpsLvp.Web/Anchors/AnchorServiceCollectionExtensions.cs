using Microsoft.Extensions.Options;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;
using OpsLvp.Web.Hosting;

namespace OpsLvp.Web.Anchors;

public static class AnchorServiceCollectionExtensions
{
    /// <summary>Request path of the on-demand anchor (administrators only).</summary>
    public const string AnchorPath = "/api/admin/anchor";

    /// <summary>
    /// Registers <see cref="AnchorOptions"/>, the key (also the state row's <see cref="IStateSealer"/>), the log and
    /// <see cref="AnchorService"/>. Call before <c>AddLiveEngine</c> so the service stops after the engine host.
    /// </summary>
    public static IServiceCollection AddAnchors(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<AnchorOptions>()
            .Bind(configuration.GetSection(AnchorOptions.SectionName))
            .ValidateShape(configuration, AnchorOptions.SectionName)
            .Validate(o => o.Interval > TimeSpan.Zero && o.Interval <= TimeSpan.FromMinutes(5), "Anchors:Interval must be between 00:00:00.001 and 00:05:00.")
            .ValidateOnStart();
        services.AddSingleton(sp => Resolve(sp.GetRequiredService<IOptions<AnchorOptions>>().Value, sp.GetRequiredService<ContentPaths>(), sp.GetRequiredService<AppPaths>()));
        services.AddSingleton<AnchorKey>();
        services.AddSingleton<IStateSealer>(sp => sp.GetRequiredService<AnchorKey>());
        services.AddSingleton<AnchorLog>();
        services.AddSingleton<AnchorService>();
        services.AddSingleton<TamperCheck>();
        services.AddHostedService(sp => sp.GetRequiredService<AnchorService>());
        return services;
    }

    /// <summary><c>POST /api/admin/anchor</c>: signs the head now and answers the anchor line (administrators only).</summary>
    public static IEndpointRouteBuilder MapAnchorApi(this IEndpointRouteBuilder endpoints)
    {
        endpoints.MapPost(AnchorPath, async (AnchorService anchors, HttpContext http, CancellationToken cancellationToken) =>
        {
            var anchor = await anchors.AnchorNowAsync($"on demand by {http.User.Identity?.Name}", cancellationToken);
            return Results.Text(anchor.ToJsonLine(), "application/json");
        }).RequireAuthorization(AccessPolicies.Admin).DisableAntiforgery();
        return endpoints;
    }

    /// <summary>The key and log paths; refuses paths inside the data folder (an attacker with the database would have them too).</summary>
    internal static AnchorFiles Resolve(AnchorOptions o, ContentPaths paths, AppPaths app)
    {
        var folder = string.IsNullOrWhiteSpace(o.Folder)
            ? Path.TrimEndingDirectorySeparator(app.DataFolder) + "-anchors"
            : Path.GetFullPath(Path.Combine(paths.ContentRoot, o.Folder));
        var key = string.IsNullOrWhiteSpace(o.KeyPath) ? Path.Combine(folder, "anchor-key.pem") : Path.GetFullPath(Path.Combine(paths.ContentRoot, o.KeyPath));
        var log = string.IsNullOrWhiteSpace(o.LogPath) ? Path.Combine(folder, "anchors.jsonl") : Path.GetFullPath(Path.Combine(paths.ContentRoot, o.LogPath));
        var data = Path.TrimEndingDirectorySeparator(app.DataFolder) + Path.DirectorySeparatorChar;
        foreach (var (name, path) in new[] { ("Anchors:KeyPath", key), ("Anchors:LogPath", log) })
        {
            if (path.StartsWith(data, StringComparison.Ordinal))
            {
                throw new OptionsValidationException(AnchorOptions.SectionName, typeof(AnchorOptions),
                    [$"{name} '{path}' is inside the data folder '{app.DataFolder}'; keep it outside, where a copy of the database does not reach."]);
            }
        }
        return new AnchorFiles(key, log);
    }
}
