using System.Collections.Concurrent;
using System.Diagnostics;
using System.Text.Json;
using Microsoft.AspNetCore.SignalR.Client;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Live;

/// <summary>A real SignalR client on /hubs/lvp while readings pour in: the state rate is capped, a phase change is not held back.</summary>
public sealed class HubRateTests
{
    [Fact]
    public async Task HubClient_GetsCoalescedStates_AndAPhaseChangeAtOnce()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
            settings["Live:MaxStatesPerSecond"] = "0.02"; // one ordinary state every 50 s
            await using var app = OpsLvpApp.Start(settings, folder);
            var states = new ConcurrentQueue<JsonElement>();
            var readerKey = await LiveClient.ReaderKeyAsync(app);
            await using var hub = new HubConnectionBuilder()
                .WithUrl(new Uri(app.BaseAddress, "/hubs/lvp"), o => o.Headers[OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header] = readerKey)
                .Build();
            hub.On<JsonElement>("state", s => states.Enqueue(s));
            await hub.StartAsync();
            await Eventually.TrueAsync(() => !states.IsEmpty, "the state sent on connect");

            // 30 deliveries of a clear-weather RVR (invented test profile: preparation below 1000 m), each a new state.
            for (var i = 0; i < 30; i++)
            {
                await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 1500 + i));
                await Task.Delay(20);
            }
            var duringBurst = states.Count;

            var watch = Stopwatch.StartNew();
            await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 900));
            await Eventually.TrueAsync(() => states.Any(s => LiveClient.Phase(s) == "preparation"), "the phase change", TimeSpan.FromSeconds(20));

            // On connect, then at most the first state of the burst: the rest wait for the 50 s interval.
            Assert.True(duringBurst <= 3, $"{duringBurst} states during a burst of 30 deliveries");
            Assert.True(watch.Elapsed < TimeSpan.FromSeconds(20), "the phase change waited for the interval");
            Assert.Equal("preparation", LiveClient.Phase(states.Last()));
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }
}
