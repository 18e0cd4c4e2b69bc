using System.Net;
using Microsoft.AspNetCore.Components.Server.Circuits;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// The real OpsLvp web app on in-process Kestrel at http://127.0.0.1:{random port}, with a temporary data folder,
/// the demo simulator off and a circuit counter added (for the circuit harness). Since access control, callers
/// get their credentials from the app itself: <see cref="IssuePushKeyAsync"/> (API key, ingest + hub-read) and
/// <see cref="IssueDisplayLinkAsync"/> (display link for /wall).
/// </summary>
public sealed class BenchServer : IAsyncDisposable
{
    private const string Actor = "bench";

    private readonly Factory _factory;

    private BenchServer(Factory factory, Uri baseAddress, string dataFolder, CircuitCounter circuits)
    {
        _factory = factory;
        BaseAddress = baseAddress;
        DataFolder = dataFolder;
        Circuits = circuits;
    }

    public Uri BaseAddress { get; }

    public string DataFolder { get; }

    public CircuitCounter Circuits { get; }

    public IServiceProvider Services => _factory.Services;

    public static BenchServer Start(IDictionary<string, string?>? extra = null)
    {
        var dataFolder = Path.Combine(Path.GetTempPath(), "opslvp-bench-server", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dataFolder);
        var settings = new Dictionary<string, string?>
        {
            ["Storage:DataFolder"] = dataFolder,
            ["Demo:Simulator"] = "Off",
            ["Logging:LogLevel:Default"] = "Warning",
            ["Engine:ProfilePath"] = Path.Combine(Engine.BenchData.RepoRoot(), "seed-demo", "profile.json"),
        };
        foreach (var (key, value) in extra ?? new Dictionary<string, string?>())
        {
            settings[key] = value;
        }
        var circuits = new CircuitCounter();
        var factory = new Factory(settings, circuits);
        factory.UseKestrel(options => options.Listen(IPAddress.Loopback, 0));
        factory.StartServer();
        var address = factory.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.Single();
        return new BenchServer(factory, new Uri(address), dataFolder, circuits);
    }

    /// <summary>Issues one API key with the ingest and hub-read scopes (POST /api/readings and /hubs/lvp); returns its secret.</summary>
    public async Task<string> IssuePushKeyAsync() =>
        (await Services.GetRequiredService<CredentialAdmin>().IssueKeyAsync(Actor, "bench push and hub", [ApiKeyStore.IngestScope, ApiKeyStore.HubReadScope])).Secret;

    /// <summary>Issues one display link; returns its path <c>/display/{secret}</c> (sets the display cookie, redirects to /wall).</summary>
    public async Task<string> IssueDisplayLinkAsync() =>
        "/display/" + (await Services.GetRequiredService<CredentialAdmin>().IssueDisplayAsync(Actor, "bench display")).Secret;

    public async ValueTask DisposeAsync()
    {
        await _factory.DisposeAsync();
        BenchFiles.TryDeleteFolder(DataFolder);
    }

    private sealed class Factory(IDictionary<string, string?> settings, CircuitCounter circuits) : WebApplicationFactory<Program>
    {
        protected override void ConfigureWebHost(IWebHostBuilder builder)
        {
            // Development, as the web tests use: static web assets (blazor.web.js, MudBlazor) are served from the build output.
            builder.UseEnvironment("Development");
            builder.UseContentRoot(Path.Combine(Engine.BenchData.RepoRoot(), "src", "OpsLvp.Web"));
            builder.ConfigureAppConfiguration(config => config.AddInMemoryCollection(settings));
            builder.ConfigureServices(services => services.AddSingleton<CircuitHandler>(circuits));
        }
    }
}
