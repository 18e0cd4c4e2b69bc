using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Retention;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// The retention alarm follows leadership (docs/engine.md R78, R86): a real app on Kestrel with its SQLite file, whose
/// readings prune cannot succeed (the export folder lies under a regular file) and whose <c>Retention:Interval</c> is a
/// day, so only winning leadership can make it run during the test. Leadership is switched by
/// <see cref="SwitchableLeadership"/>, the test stand-in for the database election. Readings and names are invented.
/// </summary>
public sealed class RetentionLeadershipTests
{
    [Fact]
    public async Task WinningLeadership_PrunesAtOnce_AndRaisesTheAlarm_LosingItTakesTheAlarmDown()
    {
        var folder = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(folder);
        var outside = Directory.CreateTempSubdirectory("opslvp-retention-leader-").FullName;
        try
        {
            var blocked = Path.Combine(outside, "not-a-folder");
            await File.WriteAllTextAsync(blocked, "invented");
            var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
            settings["Cluster:NodeId"] = "node-a";
            settings["Retention:ReadingsDays"] = "1";
            settings["Retention:ExportFolder"] = Path.Combine(blocked, "exports");
            settings["Retention:Interval"] = "1.00:00:00";
            var leadership = new SwitchableLeadership("node-a", leader: false, epoch: 1);
            await using var node = OpsLvpApp.Start(settings, folder, s => s.Replace(ServiceDescriptor.Singleton<ILeadership>(leadership)));
            var alarm = node.Services.GetRequiredService<RetentionAlarm>();
            var retention = node.Services.GetRequiredService<ReadingsRetentionService>();
            Assert.Null(alarm.Current); // a standby does not prune

            // 1. the node wins leadership (a failover): it prunes now, not a day later, and the failure is an alarm on screen
            leadership.Set(true, epoch: 2);
            var shown = await WaitForAlarmAsync(node);
            Assert.Contains(blocked, shown.GetProperty("message").GetString(), StringComparison.Ordinal);
            Assert.True(retention.LastOutcome?.Failed);
            await WaitForRaisedEntriesAsync(() => LiveClient.EntriesAsync(node), 1);

            // 2. it loses leadership: the alarm is taken down here (the new leader's run raises its own)
            leadership.Set(false);
            await Eventually.TrueAsync(() => alarm.Current is null, "the alarm taken down on the node that no longer leads", TimeSpan.FromSeconds(30));

            // 3. it leads again: a prompt run raises the alarm again, on record again
            leadership.Set(true, epoch: 3);
            await WaitForAlarmAsync(node);
            await WaitForRaisedEntriesAsync(() => LiveClient.EntriesAsync(node), 2);
            await LiveClient.AssertChainVerifiesAsync(node);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
            Directory.Delete(outside, recursive: true);
        }
    }

    [PostgresFact]
    public async Task AfterAFailover_TheNewLeaderRaisesTheAlarmAtOnce_AndTheOldOneTakesItsDown()
    {
        using var db = ProviderDatabase.Create(OpsLvpDatabase.PostgresProvider);
        var shared = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(shared);
        var outside = Directory.CreateTempSubdirectory("opslvp-retention-failover-").FullName;
        try
        {
            var blocked = Path.Combine(outside, "not-a-folder");
            await File.WriteAllTextAsync(blocked, "invented");
            var profile = LiveTestProfile.Write(shared);
            Dictionary<string, string?> Settings(string node)
            {
                var settings = TwoNodeLeadershipTests.Settings(db, profile, shared, node);
                settings["Retention:ReadingsDays"] = "1";
                settings["Retention:ExportFolder"] = Path.Combine(blocked, "exports");
                settings["Retention:Interval"] = "1.00:00:00"; // a day: only winning leadership makes a run during the test
                return settings;
            }
            await using var first = OpsLvpApp.Start(Settings("node-a"));
            await using var second = OpsLvpApp.Start(Settings("node-b"));
            await Eventually.TrueAsync(
                () => first.Services.GetRequiredService<ILeadership>().IsLeader != second.Services.GetRequiredService<ILeadership>().IsLeader,
                "exactly one node to lead", TimeSpan.FromSeconds(60));
            var (a, b, nameA) = first.Services.GetRequiredService<ILeadership>().IsLeader ? (first, second, "node-a") : (second, first, "node-b");
            var alarmA = a.Services.GetRequiredService<RetentionAlarm>();
            var alarmB = b.Services.GetRequiredService<RetentionAlarm>();

            // the first leader's run on winning fails: its alarm is up; the standby has none
            await Eventually.TrueAsync(() => alarmA.Current is not null, "the leader's retention alarm", TimeSpan.FromSeconds(60));
            Assert.Null(alarmB.Current);

            // failover: the leader's session ended server-side; b wins, runs at once and raises its own alarm, a takes its down
            Assert.Equal(1, await PostgresLeadershipTests.KillLeadershipSessionAsync(db, nameA));
            await Eventually.TrueAsync(() => b.Services.GetRequiredService<ILeadership>().IsLeader, "the standby to take over", TimeSpan.FromSeconds(60));
            await Eventually.TrueAsync(() => alarmB.Current is not null, "the new leader's retention alarm", TimeSpan.FromSeconds(60));
            await Eventually.TrueAsync(() => alarmA.Current is null, "the old leader's alarm taken down", TimeSpan.FromSeconds(60));
            var shown = await WaitForAlarmAsync(b);
            Assert.Contains(blocked, shown.GetProperty("message").GetString(), StringComparison.Ordinal);

            // each leader put its alarm on record once
            using var audit = new AuditStore(db.NewFactory());
            await WaitForRaisedEntriesAsync(() => audit.GetRangeAsync(1, long.MaxValue), 2);
            var verification = await audit.VerifyAsync();
            Assert.True(verification.Ok, verification.Detail);
        }
        finally
        {
            OpsLvpApp.TryDelete(shared);
            Directory.Delete(outside, recursive: true);
        }
    }

    /// <summary>Polls the audit log (up to 30 s) until it holds <paramref name="count"/> retention_alarm_raised entries; fails on more.</summary>
    private static async Task WaitForRaisedEntriesAsync(Func<Task<IReadOnlyList<OpsLvp.Core.Audit.AuditEntry>>> entries, int count)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(30);
        while (true)
        {
            var raised = (await entries()).Count(e => e.Kind == AuditEvents.RetentionAlarmRaised);
            Assert.True(raised <= count, $"{raised} retention_alarm_raised entries, expected {count}");
            if (raised == count)
            {
                return;
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"{raised} retention_alarm_raised entries after 30 s, expected {count}");
            }
            await Task.Delay(200);
        }
    }

    /// <summary>Polls <c>/api/state</c> (up to 60 s) until the retention alarm is shown.</summary>
    private static async Task<JsonElement> WaitForAlarmAsync(OpsLvpApp app)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(60);
        while (true)
        {
            JsonElement state;
            try
            {
                state = await LiveClient.StateAsync(app);
            }
            catch (Xunit.Sdk.XunitException) when (DateTime.UtcNow < deadline)
            {
                await Task.Delay(200); // no state published yet: the new leader is restoring
                continue;
            }
            var alarm = state.GetProperty("status").GetProperty("alarms").EnumerateArray()
                .Where(a => a.GetProperty("key").GetString() == RetentionAlarm.Key)
                .Select(a => (JsonElement?)a)
                .FirstOrDefault();
            if (alarm is { } shown)
            {
                return shown;
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException("the retention alarm was not shown within 60 s of winning leadership");
            }
            await Task.Delay(200);
        }
    }
}
