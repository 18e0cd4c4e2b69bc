using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using System.Threading.Channels;
using Microsoft.AspNetCore.SignalR.Client;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// The server clock steps back while the server runs (docs/reliability.md "Clock regression"): the app clock is a
/// stand-in that follows the system clock with an offset the test changes, as a host whose time synchronisation
/// corrected it by an hour would. Readings are invented (the live test profile, XTST).
/// </summary>
public sealed class ClockSteppedBackTests
{
    [Fact]
    public async Task ClockSteppedBackWhileRunning_IsAlarmedOnStateAndHub_ReadingsAreAnsweredAndKept_AndTheAlarmClears()
    {
        var folder = OpsLvpApp.NewDataFolder();
        var clock = new SteppableClock();
        try
        {
            await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(LiveTestProfile.Write(folder)), folder,
                services: s => s.AddSingleton<TimeProvider>(clock));
            var readerKey = await LiveClient.ReaderKeyAsync(app);
            var states = Channel.CreateUnbounded<JsonElement>();
            await using var hub = new HubConnectionBuilder().WithUrl(new Uri(app.BaseAddress, "/hubs/lvp"), o => o.Headers[OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header] = readerKey).Build();
            hub.On<JsonElement>("state", s => states.Writer.TryWrite(s));
            await hub.StartAsync();

            // before: 1500 m at TDZ (above every threshold), accepted
            var before = clock.GetUtcNow().AddSeconds(-1);
            var first = await PushAsync(app, LiveClient.Item(before, LiveTestProfile.Tdz, "rvr", 1500));
            Assert.Equal(1, first.GetProperty("accepted").GetInt32());
            Assert.Empty(Alarms(await LiveClient.StateAsync(app), "clockRegression"));

            // the host's clock is corrected one hour back while the server runs
            clock.Step(TimeSpan.FromHours(-1));
            var now = clock.GetUtcNow();

            // a reading on the corrected clock, and one from a sensor still on the old time (now an hour in the future)
            var answer = await PushAsync(app,
                LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 900),
                LiveClient.Item(before.AddSeconds(1), LiveTestProfile.Mid, "rvr", 1400));
            var items = answer.GetProperty("items").EnumerateArray().ToList();
            Assert.Equal(["accepted", "rejected"], items.Select(i => i.GetProperty("outcome").GetString()));
            Assert.Equal("future_dated", items[1].GetProperty("reason").GetString());
            Assert.Equal(1, answer.GetProperty("accepted").GetInt32());

            // the engine took the 900 m reading (900 m < 1000 m: preparation), and says why monitoring restarted
            var state = await LiveClient.WaitForPhaseAsync(app, "preparation", TimeSpan.FromSeconds(60));
            var alarm = Assert.Single(Alarms(state, "clockRegression"));
            Assert.Contains("clock stepped back", alarm.GetProperty("message").GetString(), StringComparison.Ordinal);
            var hubState = await NextAsync(states, s => LiveClient.Phase(s) == "preparation" && Alarms(s, "clockRegression").Any());
            Assert.Single(Alarms(hubState, "clockRegression"));

            // kept as the engine saw them: the 900 m reading accepted, the future one rejected with its reason, and counted
            var stored = await StoredAsync(app);
            Assert.Contains(stored, r => r.Sensor == LiveTestProfile.Tdz && r.Value == 900 && r.Accepted);
            Assert.Contains(stored, r => r.Sensor == LiveTestProfile.Mid && r.Value == 1400 && !r.Accepted && r.RejectReason == OpsLvp.Core.Readings.RejectReason.FutureDated);
            var feed = await app.GetFeedHealthAsync("push:live-test");
            Assert.Equal(2, feed.GetProperty("totalAccepted").GetInt64());
            Assert.Equal(1, feed.GetProperty("totalRejected").GetInt64());

            // and the readings go on being accepted on the corrected clock, not refused as older than the latest
            for (var i = 0; i < 5; i++)
            {
                var next = await PushAsync(app, LiveClient.Item(clock.GetUtcNow().AddMilliseconds(-500), LiveTestProfile.Tdz, "rvr", 880 - i));
                Assert.Equal(1, next.GetProperty("accepted").GetInt32());
                await Task.Delay(20);
            }
            stored = await StoredAsync(app);
            Assert.Equal(5, stored.Count(r => r.Sensor == LiveTestProfile.Tdz && r.Value is >= 876 and <= 880 && r.Accepted));
            Assert.DoesNotContain(stored, r => r.Sensor == LiveTestProfile.Tdz && !r.Accepted);

            // one audit entry for the step, naming how far the engine was ahead
            var entries = await LiveClient.EntriesAsync(app);
            var regression = Assert.Single(entries, e => e.Kind == "clock_regression");
            using (var payload = JsonDocument.Parse(regression.PayloadJson))
            {
                var ahead = payload.RootElement.GetProperty("aheadSeconds").GetDouble();
                Assert.InRange(ahead, 3500, 3700);
            }

            // the documented rule: the alarm shows for 10 minutes of the (corrected) clock, then clears by itself
            clock.Step(TimeSpan.FromMinutes(11));
            var cleared = await WaitStateAsync(app, s => !Alarms(s, "clockRegression").Any(), "the clock-regression alarm to clear");
            Assert.Equal("preparation", LiveClient.Phase(cleared));
            var after = await PushAsync(app, LiveClient.Item(clock.GetUtcNow().AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 870));
            Assert.Equal(1, after.GetProperty("accepted").GetInt32());
            Assert.Single(await LiveClient.EntriesAsync(app), e => e.Kind == "clock_regression"); // a step forward is no regression
            await LiveClient.AssertChainVerifiesAsync(app);
        }
        finally
        {
            Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static async Task<JsonElement> WaitStateAsync(OpsLvpApp app, Func<JsonElement, bool> done, string what)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(60);
        while (true)
        {
            var state = await LiveClient.StateAsync(app);
            if (done(state))
            {
                return state;
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"timed out waiting for {what}");
            }
            await Task.Delay(100);
        }
    }

    private static IEnumerable<JsonElement> Alarms(JsonElement state, string kind) =>
        state.GetProperty("status").GetProperty("alarms").EnumerateArray().Where(a => a.GetProperty("kind").GetString() == kind).ToList();

    private static async Task<IReadOnlyList<OpsLvp.Data.Stores.ReceivedReading>> StoredAsync(OpsLvpApp app) =>
        await app.Services.GetRequiredService<OpsLvp.Data.Stores.ReadingStore>().GetReceivedAsync(DateTimeOffset.UnixEpoch, DateTimeOffset.UtcNow.AddDays(1));

    private static async Task<JsonElement> PushAsync(OpsLvpApp app, params string[] items)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + string.Join(",", items) + "] }", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        Assert.Equal(HttpStatusCode.Accepted, response.StatusCode);
        return await response.Content.ReadFromJsonAsync<JsonElement>();
    }

    private static Task<JsonElement> NextAsync(Channel<JsonElement> states, Func<JsonElement, bool> match) =>
        StateChannels.NextAsync(states, match);

    /// <summary>The system clock with an offset the test steps (a host clock corrected while the server runs).</summary>
    private sealed class SteppableClock : TimeProvider
    {
        private long _offsetTicks;

        public void Step(TimeSpan by) => Interlocked.Add(ref _offsetTicks, by.Ticks);

        public override DateTimeOffset GetUtcNow() => System.GetUtcNow() + TimeSpan.FromTicks(Interlocked.Read(ref _offsetTicks));
    }
}
