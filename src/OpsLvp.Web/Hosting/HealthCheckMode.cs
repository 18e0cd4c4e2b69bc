using System.Globalization;

namespace OpsLvp.Web.Hosting;

/// <summary>
/// <c>dotnet OpsLvp.Web.dll --healthcheck</c> (the Dockerfile's HEALTHCHECK): GET http://127.0.0.1:&lt;port&gt;/health
/// without starting a server; exit 0 on 200, else 1. The port comes from <c>--urls</c>, then <c>ASPNETCORE_URLS</c>
/// (or <c>URLS</c>), else 8080; the first URL is used and a wildcard host means the loopback address.
/// </summary>
public static class HealthCheckMode
{
    public const string Switch = "--healthcheck";

    public const int DefaultPort = 8080;

    public static bool Requested(string[] args) => args.Contains(Switch, StringComparer.Ordinal);

    /// <summary>The /health URL to probe.</summary>
    public static Uri Target(string[] args, Func<string, string?> environment)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(environment);
        string? urls = null;
        for (var i = 0; i < args.Length; i++)
        {
            if (args[i] == "--urls" && i + 1 < args.Length)
            {
                urls = args[i + 1];
            }
            else if (args[i].StartsWith("--urls=", StringComparison.Ordinal))
            {
                urls = args[i]["--urls=".Length..];
            }
        }
        urls ??= environment("ASPNETCORE_URLS") ?? environment("URLS");
        var scheme = "http";
        var port = DefaultPort;
        var first = urls?.Split(';', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries).FirstOrDefault();
        if (first is not null)
        {
            var normalised = first.Replace("://*", "://localhost", StringComparison.Ordinal).Replace("://+", "://localhost", StringComparison.Ordinal);
            if (Uri.TryCreate(normalised, UriKind.Absolute, out var uri))
            {
                scheme = uri.Scheme;
                port = uri.Port;
            }
        }
        return new Uri(string.Create(CultureInfo.InvariantCulture, $"{scheme}://127.0.0.1:{port}/health"));
    }

    /// <summary>Probes once; 0 when /health answers 200 within 5 s, else 1 (with a one-line reason on stderr).</summary>
    public static async Task<int> RunAsync(string[] args)
    {
        var target = Target(args, Environment.GetEnvironmentVariable);
        using var handler = new HttpClientHandler { ServerCertificateCustomValidationCallback = HttpClientHandler.DangerousAcceptAnyServerCertificateValidator };
        using var client = new HttpClient(handler) { Timeout = TimeSpan.FromSeconds(5) };
        try
        {
            using var response = await client.GetAsync(target);
            if (response.StatusCode == System.Net.HttpStatusCode.OK)
            {
                return 0;
            }
            await Console.Error.WriteLineAsync(string.Create(CultureInfo.InvariantCulture, $"healthcheck: {target} answered {(int)response.StatusCode}"));
            return 1;
        }
        catch (Exception ex) when (ex is HttpRequestException or TaskCanceledException)
        {
            await Console.Error.WriteLineAsync($"healthcheck: {target} unreachable: {ex.Message}");
            return 1;
        }
    }
}
