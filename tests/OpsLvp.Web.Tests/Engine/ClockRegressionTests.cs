using System.Globalization;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// The engine's stored time ahead of the clock at a restart, as when a demo ran on an accelerated clock or the server
/// clock stepped back (docs/reliability.md "Clock regression"). Readings are invented.
/// </summary>
public sealed class ClockRegressionTests
{
    [Fact]
    public async Task EngineTimeAheadOfTheClock_IsRecordedAndAlarmed_AndReadingsAreAcceptedAgain()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var profile = LiveTestProfile.Write(folder);
            var ahead = DateTimeOffset.UtcNow.AddHours(1);
            var first = LiveTestProfile.Settings(profile);
            first["Demo:Simulator"] = "On";
            first["Demo:Speed"] = "1";
            first["Demo:Start"] = ahead.ToString("o", CultureInfo.InvariantCulture);
            await using (var app = OpsLvpApp.Start(first, folder))
            {
                await LiveClient.PushAsync(app, LiveClient.Item(ahead.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 1500));
                await LiveClient.EntriesAsync(app);
            }
            SqliteConnection.ClearAllPools();

            await using var second = OpsLvpApp.Start(LiveTestProfile.Settings(profile), folder);
            var t = DateTimeOffset.FromUnixTimeMilliseconds(DateTimeOffset.UtcNow.AddSeconds(-1).ToUnixTimeMilliseconds());
            await LiveClient.PushAsync(second, LiveClient.Item(t, LiveTestProfile.Tdz, "rvr", 900));
            var state = await LiveClient.WaitForPhaseAsync(second, "preparation"); // 900 m < 1000 m: the reading was taken
            Assert.Contains(state.GetProperty("status").GetProperty("alarms").EnumerateArray(), a => a.GetProperty("kind").GetString() == "clockRegression");
            var entries = await LiveClient.EntriesAsync(second);
            Assert.Single(entries, e => e.Kind == "clock_regression");
            var refused = (await second.Services.GetRequiredService<OpsLvp.Data.Stores.ReadingStore>().GetReceivedAsync(DateTimeOffset.UnixEpoch, DateTimeOffset.UtcNow.AddDays(1)))
                .Where(r => r.Time == t && !r.Accepted)
                .ToList();
            Assert.Empty(refused);
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }
}
