namespace OpsLvp.Web.Components.Shell;

public static class ScreenServiceCollectionExtensions
{
    /// <summary>Binds and checks <see cref="ScreenOptions"/> (section <c>Screens</c>); a bad value stops the app at start naming the setting.</summary>
    public static IServiceCollection AddScreens(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<ScreenOptions>()
            .Bind(configuration.GetSection(ScreenOptions.SectionName))
            .Validate(o => o.HeartbeatInterval >= TimeSpan.FromMilliseconds(200) && o.HeartbeatInterval <= TimeSpan.FromSeconds(60),
                "Screens:HeartbeatInterval must be between 00:00:00.2 and 00:01:00.")
            .Validate(o => o.TabletCardHold >= TimeSpan.FromSeconds(1) && o.TabletCardHold <= TimeSpan.FromMinutes(10),
                "Screens:TabletCardHold must be between 00:00:01 and 00:10:00.")
            .ValidateOnStart();
        return services;
    }
}
