using System.Diagnostics;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Live;

/// <summary><c>--healthcheck</c>: the probe the Dockerfile's HEALTHCHECK runs.</summary>
public sealed class HealthCheckModeTests
{
    [Theory]
    [InlineData(new[] { "--healthcheck" }, null, "http://127.0.0.1:8080/health")]
    [InlineData(new[] { "--healthcheck", "--urls", "http://0.0.0.0:5123" }, null, "http://127.0.0.1:5123/health")]
    [InlineData(new[] { "--healthcheck", "--urls=http://+:6001;http://+:6002" }, null, "http://127.0.0.1:6001/health")]
    [InlineData(new[] { "--healthcheck" }, "http://*:7070", "http://127.0.0.1:7070/health")]
    public void Target_TakesThePortFromUrlsThenTheEnvironmentElse8080(string[] args, string? aspnetcoreUrls, string expected)
    {
        var target = HealthCheckMode.Target(args, name => name == "ASPNETCORE_URLS" ? aspnetcoreUrls : null);
        Assert.Equal(new Uri(expected), target);
    }

    [Fact]
    public async Task Probe_ExitsZeroAgainstARunningServer_AndOneWhenNothingListens()
    {
        await using var app = OpsLvpApp.Start();
        // The probe allows /health 5 s, as the Dockerfile's HEALTHCHECK does; the server's first request (JIT, first
        // database read) is made here first, so a loaded machine's cold start is not what the probe measures.
        using (var warm = await app.Client.GetAsync(new Uri("/health", UriKind.Relative)))
        {
            Assert.Equal(System.Net.HttpStatusCode.OK, warm.StatusCode);
        }
        var (up, upError) = await RunProbeAsync(app.BaseAddress.ToString().TrimEnd('/'));
        Assert.True(up == 0, $"probe of a running server exited {up}: {upError}");
        var (down, downError) = await RunProbeAsync("http://127.0.0.1:9"); // discard port: nothing answers HTTP
        Assert.True(down == 1, $"probe of nothing exited {down}: {downError}");
        Assert.Contains("unreachable", downError, StringComparison.Ordinal);
    }

    private static async Task<(int ExitCode, string Error)> RunProbeAsync(string url)
    {
        var start = new ProcessStartInfo("dotnet") { RedirectStandardError = true, RedirectStandardOutput = true, UseShellExecute = false };
        start.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "OpsLvp.Web.dll"));
        start.ArgumentList.Add("--healthcheck");
        start.ArgumentList.Add("--urls");
        start.ArgumentList.Add(url);
        using var process = Process.Start(start)!;
        var error = process.StandardError.ReadToEndAsync();
        _ = process.StandardOutput.ReadToEndAsync();
        await process.WaitForExitAsync().WaitAsync(TimeSpan.FromSeconds(60));
        return (process.ExitCode, await error);
    }
}
