using System.Net;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.SignalR;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// A minimal Kestrel app on 127.0.0.1: hub <c>/hubs/bare</c> and <c>POST /bare</c>, which broadcasts a payload of
/// the requested size as <c>state</c> to every client and answers 202, like the real push path without engine or audit.
/// </summary>
public sealed class BareServer : IAsyncDisposable
{
    private readonly WebApplication _app;

    private BareServer(WebApplication app, Uri baseAddress)
    {
        _app = app;
        BaseAddress = baseAddress;
    }

    public Uri BaseAddress { get; }

    /// <summary>Size in characters of the broadcast payload (set before posting).</summary>
    public static int PayloadChars { get; set; } = 4096;

    public static async Task<BareServer> StartAsync()
    {
        var builder = WebApplication.CreateSlimBuilder();
        builder.Logging.SetMinimumLevel(LogLevel.Warning);
        builder.WebHost.UseKestrel(o => o.Listen(IPAddress.Loopback, 0));
        builder.Services.AddSignalR();
        var app = builder.Build();
        app.MapHub<BareHub>("/hubs/bare");
        app.MapPost("/bare", async (IHubContext<BareHub> hub) =>
        {
            await hub.Clients.All.SendAsync("state", new string('x', PayloadChars));
            return Results.Accepted();
        });
        await app.StartAsync();
        var address = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First();
        return new BareServer(app, new Uri(address));
    }

    public async ValueTask DisposeAsync()
    {
        await _app.StopAsync();
        await _app.DisposeAsync();
    }
}
