using System.Net;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>
/// A second tiny Kestrel app on 127.0.0.1:{random port} playing an upstream sensor feed at <c>/readings</c>.
/// Its answer is switched with <see cref="Mode"/>. Sensor ids and values are invented.
/// </summary>
public sealed class FakeUpstreamFeed : IAsyncDisposable
{
    /// <summary>Two good items (invented sensor ids and values).</summary>
    public const string GoodJson = """
        { "readings": [
            { "time": "2026-01-15T03:00:00Z", "sensor": "RVR09T", "kind": "rvr", "value": 550, "status": "ok" },
            { "time": "2026-01-15T03:00:00+01:00", "sensor": "CEIL1", "kind": "cloud_base", "value": 200, "status": "ok" }
        ] }
        """;

    /// <summary>One good item and two malformed ones (unknown kind; time without offset).</summary>
    public const string PartiallyMalformedJson = """
        { "readings": [
            { "time": "2026-01-15T03:01:00Z", "sensor": "RVR09T", "kind": "rvr", "value": 500, "status": "ok" },
            { "time": "2026-01-15T03:01:00Z", "sensor": "RVR09M", "kind": "fogginess", "value": 1, "status": "ok" },
            { "time": "2026-01-15 03:01", "sensor": "RVR09E", "kind": "rvr", "value": 600, "status": "ok" }
        ] }
        """;

    private readonly WebApplication _app;
    private int _requests;

    private FakeUpstreamFeed(WebApplication app, Uri url)
    {
        _app = app;
        Url = url;
    }

    public Uri Url { get; }

    private volatile UpstreamMode _mode;

    public UpstreamMode Mode
    {
        get => _mode;
        set => _mode = value;
    }

    public int Requests => Volatile.Read(ref _requests);

    public static async Task<FakeUpstreamFeed> StartAsync(UpstreamMode mode)
    {
        var builder = WebApplication.CreateSlimBuilder();
        builder.Logging.ClearProviders();
        builder.WebHost.UseKestrel(options => options.Listen(IPAddress.Loopback, 0));
        var app = builder.Build();
        FakeUpstreamFeed? feed = null;
        app.MapGet("/readings", async (HttpContext context) =>
        {
            Interlocked.Increment(ref feed!._requests);
            switch (feed.Mode)
            {
                case UpstreamMode.GoodJson:
                    context.Response.ContentType = "application/json";
                    await context.Response.WriteAsync(GoodJson);
                    break;
                case UpstreamMode.PartiallyMalformed:
                    context.Response.ContentType = "application/json";
                    await context.Response.WriteAsync(PartiallyMalformedJson);
                    break;
                case UpstreamMode.Http500:
                    context.Response.StatusCode = StatusCodes.Status500InternalServerError;
                    await context.Response.WriteAsync("upstream broke");
                    break;
                case UpstreamMode.Garbage:
                    context.Response.ContentType = "application/json";
                    await context.Response.Body.WriteAsync(new byte[] { 0xFF, 0xFE, 0x00, 0x7B, 0x3C, 0x68, 0x74, 0x6D, 0x6C, 0x3E, 0x81 });
                    break;
                case UpstreamMode.Hang:
                    await Task.Delay(Timeout.InfiniteTimeSpan, context.RequestAborted);
                    break;
            }
        });
        await app.StartAsync();
        var address = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.Single();
        feed = new FakeUpstreamFeed(app, new Uri(new Uri(address), "/readings")) { Mode = mode };
        return feed;
    }

    public async ValueTask DisposeAsync()
    {
        using var stop = new CancellationTokenSource(TimeSpan.FromSeconds(2));
        await _app.StopAsync(stop.Token);
        await _app.DisposeAsync();
    }
}
