using Microsoft.Data.Sqlite;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>An ordinary restart leaves a chain whose times never go backwards (docs/audit.md). Readings are invented.</summary>
public sealed class RestartAuditOrderTests
{
    [Fact]
    public async Task EventsThatFellDueWhileStopped_AreRecordedBeforeEngineStarted_SoVerifyFindsNoTimeRegression()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var profile = LiveTestProfile.Write(folder);
            await using (var first = OpsLvpApp.Start(LiveTestProfile.Settings(profile), folder))
            {
                // the live test profile keeps RVR 600 s: this reading goes stale 2 s from now, while the server is stopped
                await LiveClient.PushAsync(first, LiveClient.Item(DateTimeOffset.UtcNow.AddSeconds(-598), LiveTestProfile.Tdz, "rvr", 1500));
                await LiveClient.EntriesAsync(first);
            }
            SqliteConnection.ClearAllPools();
            await Task.Delay(TimeSpan.FromSeconds(4));

            await using var second = OpsLvpApp.Start(LiveTestProfile.Settings(profile), folder);
            var entries = await LiveClient.EntriesAsync(second);
            var started = entries.Last(e => e.Kind == "engine_started");
            var raised = entries.Where(e => e.Kind == "alarm_raised" && e.PayloadJson.Contains(LiveTestProfile.Tdz, StringComparison.Ordinal)).ToList();
            Assert.NotEmpty(raised); // the stale reading's sensor went silent while the server was stopped
            Assert.All(raised, r => Assert.True(r.Time < started.Time, $"alarm at {r.Time:o}, start at {started.Time:o}"));
            var verification = await LiveClient.Audit(second).VerifyAsync();
            Assert.True(verification.Ok, verification.Detail);
            Assert.Null(verification.FirstTimeRegressionSequence);
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            OpsLvpApp.TryDelete(folder);
        }
    }
}
