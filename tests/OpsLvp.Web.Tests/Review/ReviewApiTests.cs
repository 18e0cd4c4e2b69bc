using System.Net;
using System.Text.Json;
using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.AspNetCore.TestHost;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Review;
using OpsLvp.Web.Review;

namespace OpsLvp.Web.Tests.Review;

/// <summary>The /api/episodes group over the invented demo night (in-memory test server, record replaced, a viewer signed in).</summary>
public sealed class ReviewApiTests : IAsyncLifetime
{
    private readonly string _data = Path.Combine(Path.GetTempPath(), "opslvp-tests", Guid.NewGuid().ToString("N"));
    private Factory _factory = default!;
    private HttpClient _client = default!;

    public Task InitializeAsync()
    {
        Directory.CreateDirectory(_data);
        _factory = new Factory(_data);
        _client = _factory.CreateClient();
        return Task.CompletedTask;
    }

    public async Task DisposeAsync()
    {
        _client.Dispose();
        await _factory.DisposeAsync();
        Directory.Delete(_data, recursive: true);
    }

    private static string EpisodeId => EpisodeModel.Build(DemoNightSource.Record.Events, DemoNightSource.Record.Readings, DateTimeOffset.MaxValue)[0].Id;

    [Fact]
    public async Task List_NamesTheEpisode_WithItsFiguresAndTheChainStatus()
    {
        using var doc = JsonDocument.Parse(await _client.GetStringAsync(new Uri("/api/episodes", UriKind.Relative)));

        Assert.True(doc.RootElement.GetProperty("chain_verifies").GetBoolean());
        var e = Assert.Single(doc.RootElement.GetProperty("episodes").EnumerateArray());
        Assert.Equal(EpisodeId, e.GetProperty("id").GetString());
        Assert.Equal("active", e.GetProperty("deepest_phase").GetString());
        // Preparation entered 20:37:06 on the invented demo night (seed-demo/README.md).
        Assert.Equal("2026-01-15T20:37:06Z", e.GetProperty("start").GetString());
    }

    [Fact]
    public async Task ExportJson_Downloaded_ReplaysToTheRecordedTransitions()
    {
        using var response = await _client.GetAsync(new Uri($"/api/episodes/{EpisodeId}/export.json", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);

        var export = EpisodeExport.Parse(await response.Content.ReadAsStringAsync());

        Assert.True(export.VerifyAudit().Ok);
        var replayed = export.Replay().Events.Select(RecordedEvent.FromEvent).Where(e => e.Name == "transition").Select(e => e.Json);
        Assert.Equal(export.Events.Where(e => e.Name == "transition").Select(e => e.Json), replayed);
    }

    [Fact]
    public async Task CsvExports_HaveTheirHeaders_AndParse()
    {
        var readings = await _client.GetStringAsync(new Uri($"/api/episodes/{EpisodeId}/readings.csv", UriKind.Relative));
        var audit = await _client.GetStringAsync(new Uri($"/api/episodes/{EpisodeId}/audit.csv", UriKind.Relative));

        Assert.NotEmpty(ReadingsCsv.Parse(readings, "readings.csv"));
        Assert.StartsWith(ReviewCsv.AuditHeader + "\n", audit, StringComparison.Ordinal);
    }

    [Fact]
    public async Task CapabilityCsv_CarriesEachDirectionsCapabilityOverTheEpisode()
    {
        var csv = await _client.GetStringAsync(new Uri($"/api/episodes/{EpisodeId}/capability.csv", UriKind.Relative));

        var lines = csv.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(CapabilityExport.CsvHeader, lines[0]);
        // the demo night's scripted fault: the field-lighting crew marks the 07L TDZ lights unserviceable (seed-demo, invented)
        Assert.Contains(lines, l => l.Contains(",07L,true,change,", StringComparison.Ordinal) && l.Contains("TDZ lights 07L unserviceable", StringComparison.Ordinal));
    }

    [Fact]
    public async Task UnknownEpisode_Is404NamingIt()
    {
        using var response = await _client.GetAsync(new Uri("/api/episodes/XDMO-none/audit.csv", UriKind.Relative));

        Assert.Equal(HttpStatusCode.NotFound, response.StatusCode);
        Assert.Contains("XDMO-none", await response.Content.ReadAsStringAsync(), StringComparison.Ordinal);
    }

    private sealed class Factory(string data) : WebApplicationFactory<Program>
    {
        protected override void ConfigureWebHost(IWebHostBuilder builder)
        {
            builder.UseEnvironment("Development");
            builder.ConfigureAppConfiguration(c => c.AddInMemoryCollection(new Dictionary<string, string?>
            {
                ["Storage:DataFolder"] = data,
                ["Demo:Simulator"] = "Off",
                ["Logging:LogLevel:Default"] = "Warning",
            }));
            builder.ConfigureTestServices(s =>
            {
                s.AddSingleton<IEpisodeSource>(new DemoNightSource());
                // The review API needs a signed-in account (access is checked in EndpointAccessTests); here every
                // request is an invented viewer so the tests read the API's content.
                s.AddAuthentication().AddScheme<AuthenticationSchemeOptions, SignedInViewerHandler>(SignedInViewerHandler.SchemeName, _ => { });
                s.PostConfigure<AuthenticationOptions>(o => o.DefaultScheme = SignedInViewerHandler.SchemeName);
            });
        }
    }
}
