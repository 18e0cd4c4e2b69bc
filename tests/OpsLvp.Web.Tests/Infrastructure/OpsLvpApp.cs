using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.AspNetCore.TestHost;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>
/// The real OpsLvp web app on Kestrel at http://127.0.0.1:{random port}, with its own temporary data folder
/// and configuration overrides. The demo simulator is off unless a test turns it on.
/// </summary>
public sealed class OpsLvpApp : IAsyncDisposable
{
    private readonly Factory _factory;

    private readonly bool _ownsDataFolder;

    private OpsLvpApp(Factory factory, Uri baseAddress, string dataFolder, bool ownsDataFolder)
    {
        _ownsDataFolder = ownsDataFolder;
        _factory = factory;
        BaseAddress = baseAddress;
        DataFolder = dataFolder;
        Client = new HttpClient { BaseAddress = baseAddress, Timeout = TimeSpan.FromSeconds(20) };
    }

    public Uri BaseAddress { get; }

    public string DataFolder { get; }

    /// <summary>A plain HTTP client talking to the Kestrel socket (no in-memory test server).</summary>
    public HttpClient Client { get; }

    public IServiceProvider Services => _factory.Services;

    public ReadingPipeline Pipeline => Services.GetRequiredService<ReadingPipeline>();

    public FeedHealthRegistry Health => Services.GetRequiredService<FeedHealthRegistry>();

    /// <summary>A fresh temporary data folder (deleted by the caller when it passes it to <see cref="Start"/>).</summary>
    public static string NewDataFolder() => Path.Combine(Path.GetTempPath(), "opslvp-tests", Guid.NewGuid().ToString("N"));

    /// <summary>
    /// Starts the app; with <paramref name="dataFolder"/> it uses (and keeps) that folder, e.g. to restart on the same database;
    /// <paramref name="services"/> changes the app's services after its own registrations (e.g. a test leadership);
    /// <paramref name="environment"/> is the hosting environment ("Production" for the production error handling).
    /// </summary>
    public static OpsLvpApp Start(IDictionary<string, string?>? settings = null, string? dataFolder = null, Action<IServiceCollection>? services = null,
        string environment = "Development")
    {
        var owns = dataFolder is null;
        dataFolder ??= NewDataFolder();
        Directory.CreateDirectory(dataFolder);
        var all = new Dictionary<string, string?>
        {
            ["Storage:DataFolder"] = dataFolder,
            ["Demo:Simulator"] = "Off",
            ["Logging:LogLevel:Default"] = "Warning",
        };
        foreach (var (key, value) in settings ?? new Dictionary<string, string?>())
        {
            all[key] = value;
        }

        var factory = new Factory(all, services, environment);
        factory.UseKestrel(options => options.Listen(IPAddress.Loopback, 0));
        try
        {
            factory.StartServer();
        }
        catch
        {
            factory.Dispose();
            if (owns)
            {
                TryDelete(dataFolder);
            }
            throw;
        }

        var address = factory.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.Single();
        return new OpsLvpApp(factory, new Uri(address), dataFolder, owns);
    }

    /// <summary>GET /health, asserting the server answers 200 (it must stay healthy whatever the feeds do).</summary>
    public async Task<JsonElement> GetHealthAsync()
    {
        using var response = await Client.GetAsync(new Uri("/health", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        return await response.Content.ReadFromJsonAsync<JsonElement>();
    }

    /// <summary>The named feed's entry in GET /health.</summary>
    public async Task<JsonElement> GetFeedHealthAsync(string name)
    {
        var health = await GetHealthAsync();
        return health.GetProperty("feeds").EnumerateArray().Single(f => f.GetProperty("name").GetString() == name);
    }

    /// <summary>Reads batches from the pipeline until one matches, failing after <paramref name="timeout"/>.</summary>
    public async Task<ReadingBatch> NextBatchAsync(Func<ReadingBatch, bool> match, TimeSpan? timeout = null)
    {
        using var cts = new CancellationTokenSource(timeout ?? TimeSpan.FromSeconds(10));
        try
        {
            await foreach (var batch in Pipeline.ReadAllAsync(cts.Token))
            {
                if (match(batch))
                {
                    return batch;
                }
            }
        }
        catch (OperationCanceledException)
        {
        }

        throw new Xunit.Sdk.XunitException("no matching batch reached the reading pipeline in time");
    }

    public async ValueTask DisposeAsync()
    {
        Client.Dispose();
        await _factory.DisposeAsync();
        if (_ownsDataFolder)
        {
            TryDelete(DataFolder);
        }
    }

    public static void TryDelete(string folder)
    {
        // the anchor key and log live beside the data folder by default (docs/audit.md "Anchors")
        var anchors = Path.TrimEndingDirectorySeparator(folder) + "-anchors";
        if (Directory.Exists(anchors))
        {
            TryDeleteFolder(anchors);
        }
        TryDeleteFolder(folder);
    }

    private static void TryDeleteFolder(string folder)
    {
        try
        {
            Directory.Delete(folder, recursive: true);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }

    private sealed class Factory(IDictionary<string, string?> settings, Action<IServiceCollection>? services, string environment) : WebApplicationFactory<Program>
    {
        protected override void ConfigureWebHost(IWebHostBuilder builder)
        {
            builder.UseEnvironment(environment);
            builder.ConfigureAppConfiguration(config => config.AddInMemoryCollection(settings));
            if (services is not null)
            {
                builder.ConfigureTestServices(services);
            }
        }
    }
}
