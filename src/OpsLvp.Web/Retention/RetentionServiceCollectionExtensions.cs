using Microsoft.Extensions.Options;
using OpsLvp.Data.Retention;
using OpsLvp.Web.Hosting;

namespace OpsLvp.Web.Retention;

public static class RetentionServiceCollectionExtensions
{
    /// <summary>Registers <see cref="RetentionOptions"/>, the <see cref="ReadingsPruner"/> and <see cref="ReadingsRetentionService"/>. Needs <c>AddLiveEngine</c>.</summary>
    public static IServiceCollection AddReadingsRetention(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<RetentionOptions>()
            .Bind(configuration.GetSection(RetentionOptions.SectionName))
            .ValidateShape(configuration, RetentionOptions.SectionName)
            .Validate(o => o.ReadingsDays is >= 0 and <= 36_500, "Retention:ReadingsDays must be between 0 (keep everything) and 36500.")
            .Validate(o => o.Interval >= TimeSpan.FromSeconds(1) && o.Interval <= TimeSpan.FromDays(1), "Retention:Interval must be between 00:00:01 and 1.00:00:00.")
            .Validate(o => o.BatchSize is >= 1 and <= 1_000_000, "Retention:BatchSize must be between 1 and 1000000.")
            .Validate(o => o.MaxReadingsPerRun is >= 1 and <= 100_000_000, "Retention:MaxReadingsPerRun must be between 1 and 100000000.")
            .ValidateOnStart();
        services.AddSingleton(sp => Resolve(sp.GetRequiredService<IOptions<RetentionOptions>>().Value, sp.GetRequiredService<ContentPaths>(), sp.GetRequiredService<AppPaths>()));
        services.AddSingleton<ReadingsPruner>();
        services.AddSingleton<ReadingsRetentionService>();
        services.AddHostedService(sp => sp.GetRequiredService<ReadingsRetentionService>());
        return services;
    }

    /// <summary>The export folder; refuses one inside the data folder (a copy of the database must not carry its own evidence).</summary>
    internal static RetentionFolder Resolve(RetentionOptions o, ContentPaths paths, AppPaths app)
    {
        var folder = string.IsNullOrWhiteSpace(o.ExportFolder)
            ? Path.TrimEndingDirectorySeparator(app.DataFolder) + "-exports"
            : Path.GetFullPath(Path.Combine(paths.ContentRoot, o.ExportFolder));
        var data = Path.TrimEndingDirectorySeparator(app.DataFolder);
        if (string.Equals(Path.TrimEndingDirectorySeparator(folder), data, StringComparison.Ordinal) || folder.StartsWith(data + Path.DirectorySeparatorChar, StringComparison.Ordinal))
        {
            throw new OptionsValidationException(RetentionOptions.SectionName, typeof(RetentionOptions),
                [$"Retention:ExportFolder '{folder}' is inside the data folder '{app.DataFolder}'; keep it outside the database's folder."]);
        }
        return new RetentionFolder(folder);
    }
}
