using Microsoft.AspNetCore.HttpOverrides;
using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Hosting;

/// <summary>
/// Forwarded headers from trusted reverse proxies only (<see cref="NetworkOptions"/>): behind nginx the client's address
/// (sign-in throttling per address, the audit of failed sign-ins) and scheme (secure cookies, HTTPS redirection) are the
/// ones the proxy saw. One proxy hop is believed: the proxy must set, not pass on, <c>X-Forwarded-For</c>.
/// </summary>
public static class NetworkServiceCollectionExtensions
{
    public static IServiceCollection AddTrustedProxies(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<NetworkOptions>()
            .Bind(configuration.GetSection(NetworkOptions.SectionName))
            .ValidateShape(configuration, NetworkOptions.SectionName)
            .ValidateOnStart();
        services.AddSingleton<IValidateOptions<NetworkOptions>, Validator>();
        services.AddOptions<ForwardedHeadersOptions>().Configure<IOptions<NetworkOptions>>((forwarded, network) =>
        {
            forwarded.ForwardedHeaders = ForwardedHeaders.XForwardedFor | ForwardedHeaders.XForwardedProto;
            forwarded.ForwardLimit = 1;
            // The defaults trust loopback; only what the setting names is trusted.
            forwarded.KnownProxies.Clear();
            forwarded.KnownIPNetworks.Clear();
            foreach (var trusted in network.Value.TrustedNetworks())
            {
                forwarded.KnownIPNetworks.Add(trusted);
            }
        });
        return services;
    }

    /// <summary>First in the pipeline, so everything after it sees the client's address and scheme. Does nothing when no proxy is trusted.</summary>
    public static WebApplication UseTrustedProxies(this WebApplication app)
    {
        ArgumentNullException.ThrowIfNull(app);
        var trusted = app.Services.GetRequiredService<IOptions<NetworkOptions>>().Value.TrustedNetworks();
        if (trusted.Count == 0)
        {
            return app;
        }
        app.Logger.LogInformation("X-Forwarded-For and X-Forwarded-Proto are taken from the trusted proxies {Proxies} (Network:TrustedProxies)",
            string.Join(", ", trusted));
        app.UseForwardedHeaders();
        return app;
    }

    private sealed class Validator : IValidateOptions<NetworkOptions>
    {
        public ValidateOptionsResult Validate(string? name, NetworkOptions options)
        {
            try
            {
                options.TrustedNetworks();
                return ValidateOptionsResult.Success;
            }
            catch (FormatException ex)
            {
                return ValidateOptionsResult.Fail(ex.Message);
            }
        }
    }
}
