using System.Text.Json;
using System.Threading.Channels;
using Microsoft.AspNetCore.SignalR.Client;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Core.Readings;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Live;

/// <summary>The engine host over real Kestrel, a temporary SQLite file and a real SignalR client. Readings invented.</summary>
public sealed class LiveEngineTests
{
    [Fact]
    public async Task PushedReadings_ReachHubClientsAsStateWithTheNewPhase_AndApiStateAgrees()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(LiveTestProfile.Write(folder)), folder);
            var states = Channel.CreateUnbounded<JsonElement>();
            var readerKey = await LiveClient.ReaderKeyAsync(app);
            await using var hub = new HubConnectionBuilder().WithUrl(new Uri(app.BaseAddress, "/hubs/lvp"), o => o.Headers[OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header] = readerKey).Build();
            hub.On<JsonElement>("state", s => states.Writer.TryWrite(s));
            await hub.StartAsync();

            var first = await NextAsync(states, _ => true);
            Assert.Equal("normal", LiveClient.Phase(first));
            Assert.Equal("XTST", first.GetProperty("aerodrome").GetProperty("id").GetString());

            // 900 m < preparation.rvrBelow 1000 m, enter dwell 0 s (invented test profile)
            await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 900));
            var pushed = await NextAsync(states, s => LiveClient.Phase(s) == "preparation");
            Assert.Equal(900, pushed.GetProperty("status").GetProperty("governingRvr").GetProperty("value").GetDouble());
            var item = Assert.Single(pushed.GetProperty("items").EnumerateArray());
            Assert.Equal("Test preparation item", item.GetProperty("text").GetString());
            Assert.Equal("Test operations", item.GetProperty("teamName").GetString());
            Assert.Equal("open", item.GetProperty("status").GetString());

            var api = await LiveClient.StateAsync(app);
            Assert.Equal("preparation", LiveClient.Phase(api));
            Assert.True(api.GetProperty("version").GetInt64() >= pushed.GetProperty("version").GetInt64());
            var trend = api.GetProperty("trends").EnumerateArray().Single(t => t.GetProperty("sensorId").GetString() == LiveTestProfile.Tdz);
            Assert.Equal(900, trend.GetProperty("oneMinuteMeanM").GetDouble());

            var entries = await LiveClient.EntriesAsync(app);
            Assert.Contains(entries, e => e.Kind == "transition" && e.PayloadJson.Contains("\"to\":\"preparation\"", StringComparison.Ordinal));
            Assert.Contains(entries, e => e.Kind == "episode_started");
            Assert.DoesNotContain(entries, e => e.Kind == "reading_rejected");
            await LiveClient.AssertChainVerifiesAsync(app);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task RawForwardScatterReading_IsTurnedIntoRvr_ThatGoverns()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(LiveTestProfile.Write(folder)), folder);
            // σ = 20/km: MOR ≈ 150 m, well under 550 m whatever the lights add (Koschmieder/Allard, docs/sources.md)
            await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Mid, "extinction", 20));
            var state = await LiveClient.WaitForPhaseAsync(app, "active");
            var rvr = state.GetProperty("status").GetProperty("governingRvr");
            Assert.Equal(LiveTestProfile.Mid, rvr.GetProperty("sensorId").GetString());
            Assert.InRange(rvr.GetProperty("value").GetDouble(), 150, 549);
            var rows = await app.Services.GetRequiredService<ReadingStore>().GetReceivedAsync(DateTimeOffset.UtcNow.AddHours(-1), DateTimeOffset.UtcNow.AddHours(1));
            Assert.Contains(rows, r => r.Kind == nameof(ReadingKind.Rvr) && r.Sensor == LiveTestProfile.Mid && r.Accepted && r.Source.EndsWith(":derived", StringComparison.Ordinal));
            await LiveClient.AssertChainVerifiesAsync(app);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task EveryKindOfRejectedReading_IsStoredWithItsReasonCode_AndTheServerStaysHealthy()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(LiveTestProfile.Write(folder)), folder);
            var now = DateTimeOffset.UtcNow;
            var good = LiveClient.Item(now, LiveTestProfile.Tdz, "rvr", 1500);
            await LiveClient.PushAsync(app,
                """{ "time": "2026-01-15T04:00:00Z", "sensor": "t-tdz", "kind": "rvr", "value": "lots", "status": "ok" }""",
                LiveClient.Item(now, LiveTestProfile.Tdz, "rvr", 20_000),
                LiveClient.Item(now.AddHours(1), LiveTestProfile.Tdz, "rvr", 1500),
                good,
                good,
                LiveClient.Item(now.AddSeconds(-10), LiveTestProfile.Tdz, "rvr", 1400),
                LiveClient.Item(now, "t-nowhere", "rvr", 1500),
                LiveClient.Item(now.AddSeconds(1), LiveTestProfile.Tdz, "rvr", 1500, "failed"));
            var store = app.Services.GetRequiredService<ReadingStore>();
            IReadOnlyList<ReceivedReading> rows = [];
            var deadline = DateTime.UtcNow.AddSeconds(10);
            while (rows.Count < 8 && DateTime.UtcNow < deadline)
            {
                await Task.Delay(50);
                rows = await store.GetReceivedAsync(now.AddHours(-1), now.AddHours(2));
            }
            // reason codes of docs/engine.md R1/R2 (RejectReason)
            Assert.Equal(
                new[] { RejectReason.Malformed, RejectReason.OutOfRange, RejectReason.FutureDated, RejectReason.Duplicate, RejectReason.OlderThanLatest, RejectReason.UnknownSensor, RejectReason.StatusNotOk }.Order(),
                rows.Where(r => !r.Accepted).Select(r => r.RejectReason!.Value).Order());
            Assert.Single(rows, r => r.Accepted);
            Assert.All(rows.Where(r => !r.Accepted), r => Assert.False(string.IsNullOrWhiteSpace(r.RejectDetail)));
            var health = await app.GetHealthAsync();
            Assert.Equal("ok", health.GetProperty("engine").GetProperty("audit").GetString());
            Assert.Equal("normal", LiveClient.Phase(await LiveClient.StateAsync(app)));
            await LiveClient.AssertChainVerifiesAsync(app);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task Restart_RestoresState_AndADwellRunningAtShutdownCompletesAtItsOriginalInstant()
    {
        // active enter dwell, invented; long enough that the first server is surely stopped before it ends (start, push,
        // wait and stop can take several seconds on a loaded machine)
        const int dwell = 12;
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder, activeEnterDwellSeconds: dwell));
            DateTimeOffset pushedAt;
            await using (var first = OpsLvpApp.Start(settings, folder))
            {
                pushedAt = DateTimeOffset.UtcNow;
                // 500 m: preparation at once (dwell 0), active after the dwell
                await LiveClient.PushAsync(first, LiveClient.Item(pushedAt, LiveTestProfile.Tdz, "rvr", 500));
                await LiveClient.WaitForPhaseAsync(first, "preparation");
            }
            Assert.True(DateTimeOffset.UtcNow < pushedAt.AddSeconds(dwell), "the first server must stop while the dwell is running");
            var wait = pushedAt.AddSeconds(dwell + 1) - DateTimeOffset.UtcNow;
            if (wait > TimeSpan.Zero)
            {
                await Task.Delay(wait);
            }
            await using var second = OpsLvpApp.Start(settings, folder);
            // how soon it shows is the machine's speed; the instant the transition carries is checked below
            var state = await LiveClient.WaitForPhaseAsync(second, "active", TimeSpan.FromSeconds(60));
            Assert.Equal(2, state.GetProperty("items").GetArrayLength());
            var entries = await LiveClient.EntriesAsync(second);
            var toPreparation = entries.Single(e => e.Kind == "transition" && e.PayloadJson.Contains("\"to\":\"preparation\"", StringComparison.Ordinal));
            var toActive = entries.Single(e => e.Kind == "transition" && e.PayloadJson.Contains("\"to\":\"active\"", StringComparison.Ordinal));
            var restarted = entries.Last(e => e.Kind == "engine_started");
            Assert.Contains("\"restored\":true", restarted.PayloadJson, StringComparison.Ordinal);
            // fired by the first evaluation after the restart, stamped with the exact dwell completion (docs/engine.md R7),
            // and recorded before engine_started (stamped at the restart) so the chain's times never go back
            Assert.True(toActive.Sequence < restarted.Sequence);
            Assert.True(restarted.Time > toActive.Time);
            Assert.Null((await LiveClient.Audit(second).VerifyAsync()).FirstTimeRegressionSequence);
            Assert.Equal(TimeSpan.FromSeconds(dwell), toActive.Time - toPreparation.Time);
            await LiveClient.AssertChainVerifiesAsync(second);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static Task<JsonElement> NextAsync(Channel<JsonElement> states, Func<JsonElement, bool> match) =>
        StateChannels.NextAsync(states, match, TimeSpan.FromSeconds(15));
}
