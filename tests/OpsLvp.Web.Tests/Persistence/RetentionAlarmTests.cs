using System.Globalization;
using System.Text.Json;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Core.Engine;
using OpsLvp.Data.Retention;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Retention;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Persistence;

/// <summary>
/// A failed readings prune is seen (docs/retention.md "When a run fails", docs/engine.md R78): on a real app on Kestrel
/// with its SQLite file, an export folder blocked by a regular file raises the on-screen alarm (in <c>/api/state</c>,
/// with an audit entry), a duty manager acknowledges it (audited in their name, a second time refused), and the next
/// run after the folder is freed prunes and clears it. Readings and names are invented.
/// </summary>
public sealed class RetentionAlarmTests
{
    private static readonly CommandCaller s_dutyManager = new("r.vale (invented)", new HashSet<string> { Roles.DutyManager }, new HashSet<string>(), true);

    [Fact]
    public async Task ABlockedExportFolder_RaisesTheAlarm_ItIsAcknowledged_AndAGoodRunClearsIt()
    {
        var folder = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(folder);
        var outside = Directory.CreateTempSubdirectory("opslvp-retention-alarm-").FullName;
        try
        {
            var profile = LiveTestProfile.Write(folder);

            // 1. a reading received three days ago (a demo clock started then), no episode open; the next start's
            //    engine_started entry puts it on record
            var then = DateTimeOffset.UtcNow.AddDays(-3);
            var first = LiveTestProfile.Settings(profile);
            first["Demo:Simulator"] = "On";
            first["Demo:Speed"] = "1";
            first["Demo:Start"] = then.ToString("o", CultureInfo.InvariantCulture);
            first["Demo:ScenarioPath"] = Path.Combine(outside, "no-scenario.csv"); // the simulator stays idle
            await using (var app = OpsLvpApp.Start(first, folder))
            {
                await LiveClient.PushAsync(app, LiveClient.Item(then.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 1500)); // 202 once stored
            }
            SqliteConnection.ClearAllPools();

            // 2. today, keeping one day, with a regular file where the export folder should be
            var blocked = Path.Combine(outside, "not-a-folder");
            await File.WriteAllTextAsync(blocked, "invented");
            var second = LiveTestProfile.Settings(profile);
            second["Retention:ReadingsDays"] = "1";
            second["Retention:ExportFolder"] = Path.Combine(blocked, "exports");
            second["Retention:Interval"] = "1.00:00:00"; // one run at start; the test runs the next itself
            await using var node = OpsLvpApp.Start(second, folder);
            var retention = node.Services.GetRequiredService<ReadingsRetentionService>();
            await LiveClient.WaitForPhaseAsync(node, "normal", TimeSpan.FromSeconds(60)); // restored: engine_started is committed

            // the run at start may have come before that entry; this one has a covered reading to export and cannot
            Assert.True((await retention.RunOnceAsync(CancellationToken.None)).Failed);
            var raised = await WaitForAlarmAsync(node, present: true);
            Assert.Equal("retentionFailing", raised.GetProperty("kind").GetString());
            Assert.Contains(blocked, raised.GetProperty("message").GetString(), StringComparison.Ordinal);
            Assert.True(retention.LastOutcome?.Failed);
            Assert.Single(await LiveClient.EntriesAsync(node), e => e.Kind == AuditEvents.RetentionAlarmRaised);

            // another failing run keeps the one alarm and writes no second entry
            Assert.True((await retention.RunOnceAsync(CancellationToken.None)).Failed);
            Assert.Single(await LiveClient.EntriesAsync(node), e => e.Kind == AuditEvents.RetentionAlarmRaised);

            // 3. acknowledged by the duty manager like any alarm, on record in their name; a second time is refused
            var commands = node.Services.GetRequiredService<ILvpCommandService>();
            var ack = await commands.ExecuteAsync(s_dutyManager, new AcknowledgeAlarm("", RetentionAlarm.Key));
            Assert.True(ack.Applied, ack.Message);
            var acked = (await LiveClient.EntriesAsync(node)).Single(e => e.Kind == AuditEvents.RetentionAlarmAcknowledged);
            Assert.Equal(s_dutyManager.Name, acked.Actor);
            Assert.Equal(ack.AuditSequence, acked.Sequence);
            var shown = await WaitForAlarmAsync(node, present: true, acknowledged: true);
            Assert.Equal(s_dutyManager.Name, shown.GetProperty("acknowledgedBy").GetString());
            var again = await commands.ExecuteAsync(s_dutyManager, new AcknowledgeAlarm("", RetentionAlarm.Key));
            Assert.Equal(CommandOutcomeKind.Refused, again.Kind);
            Assert.Contains("already acknowledged", again.Message, StringComparison.Ordinal);

            // 4. the folder freed, the next run prunes and clears the alarm
            File.Delete(blocked);
            var outcome = await retention.RunOnceAsync(CancellationToken.None);
            Assert.False(outcome.Failed, outcome.Failure);
            Assert.NotNull(outcome.Pruned);
            await WaitForAlarmAsync(node, present: false);
            var entries = await LiveClient.EntriesAsync(node);
            Assert.Single(entries, e => e.Kind == AuditEvents.RetentionAlarmCleared);
            Assert.Single(entries, e => e.Kind == PrunedReadings.Kind);
            await LiveClient.AssertChainVerifiesAsync(node);

            // a refused acknowledgement of an alarm no longer raised
            var late = await commands.ExecuteAsync(s_dutyManager, new AcknowledgeAlarm("", RetentionAlarm.Key));
            Assert.NotEqual(CommandOutcomeKind.Applied, late.Kind);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
            Directory.Delete(outside, recursive: true);
        }
    }

    /// <summary>Polls <c>/api/state</c> until the retention alarm is shown (acknowledged if asked) or gone.</summary>
    private static async Task<JsonElement> WaitForAlarmAsync(OpsLvpApp app, bool present, bool acknowledged = false)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(30);
        while (true)
        {
            var state = await LiveClient.StateAsync(app);
            var alarm = state.GetProperty("status").GetProperty("alarms").EnumerateArray()
                .Where(a => a.GetProperty("key").GetString() == RetentionAlarm.Key)
                .Select(a => (JsonElement?)a)
                .FirstOrDefault();
            if (present ? alarm is { } a && (!acknowledged || a.GetProperty("acknowledgedBy").ValueKind == JsonValueKind.String) : alarm is null)
            {
                return alarm ?? state;
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"the retention alarm was {(alarm is null ? "not shown" : alarm.ToString())}, expected {(present ? "shown" : "gone")}");
            }
            await Task.Delay(100);
        }
    }
}
