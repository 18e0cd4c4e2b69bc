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
        Assert.Equal(0, await RunProbeAsync(app.BaseAddress.ToString().TrimEnd('/')));
        Assert.Equal(1, await RunProbeAsync("http://127.0.0.1:9")); // discard port: nothing answers HTTP
    }

    private static async Task<int> RunProbeAsync(string url)
    {
        var start = new ProcessStartInfo("dotnet") { RedirectStandardError = true, RedirectStandardOutput = true, UseShellExecute = false };
        start.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "OpsLvp.Web.dll"));
        start.ArgumentList.Add("--healthcheck");
        start.ArgumentList.Add("--urls");
        start.ArgumentList.Add(url);
        using var process = Process.Start(start)!;
        await process.WaitForExitAsync().WaitAsync(TimeSpan.FromSeconds(30));
        return process.ExitCode;
    }
}
