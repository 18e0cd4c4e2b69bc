using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using Microsoft.Extensions.Logging;
using Npgsql;
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
/// The retention alarm's entries are fenced like the engine's appends (docs/engine.md R71, R78, R86): a real app on
/// Kestrel on a throwaway PostgreSQL cluster whose readings prune cannot succeed (the export folder lies under a regular
/// file) and whose <c>Retention:Interval</c> is a day, so only winning leadership makes it run during the test. The
/// node's leadership is <see cref="SwitchableLeadership"/> (the test stand-in for the election), so the test can make it
/// believe it still leads after the epoch in the database has moved on, as a node that missed a takeover would. The
/// epoch row is the real one every fenced append checks. Names and values are invented.
/// </summary>
public sealed class RetentionFencingTests
{
    [PostgresFact]
    public async Task RetentionAlarmEntry_WithAStaleEpoch_WritesNothing_AndTheAlarmIsTakenDown()
    {
        using var db = ProviderDatabase.Create(OpsLvpDatabase.PostgresProvider);
        var shared = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(shared);
        var outside = Directory.CreateTempSubdirectory("opslvp-retention-fence-").FullName;
        try
        {
            var blocked = Path.Combine(outside, "not-a-folder");
            await File.WriteAllTextAsync(blocked, "invented");
            var settings = TwoNodeLeadershipTests.Settings(db, LiveTestProfile.Write(shared), shared, "node-r");
            settings["Retention:ReadingsDays"] = "1";
            settings["Retention:ExportFolder"] = Path.Combine(blocked, "exports");
            settings["Retention:Interval"] = "1.00:00:00";
            var leadership = new SwitchableLeadership("node-r", leader: false, epoch: 1);
            await using var node = OpsLvpApp.Start(settings, services: s => s.Replace(ServiceDescriptor.Singleton<ILeadership>(leadership)));
            using var log = new CapturingLoggerProvider();
            node.Services.GetRequiredService<ILoggerFactory>().AddProvider(log);
            var alarm = node.Services.GetRequiredService<RetentionAlarm>();
            using var audit = new AuditStore(db.NewFactory());
            // the node has migrated the database; epoch 1 is on record as node-r's
            await SetEpochAsync(db, 1, "node-r");

            // 1. leading with the current epoch: the failing run's alarm is on record
            leadership.Set(true, epoch: 1);
            await Eventually.TrueAsync(() => alarm.Current is not null, "the retention alarm", TimeSpan.FromSeconds(60));
            await WaitForRaisedAsync(audit, 1);

            // 2. another node takes over (epoch 2 on record); this one misses it, stands by, then believes it leads with
            //    epoch 1 again: its run fails and raises the alarm, whose entry is refused for the stale epoch
            await SetEpochAsync(db, 2, "node-s");
            leadership.Set(false);
            await Eventually.TrueAsync(() => alarm.Current is null, "the alarm taken down on the node that no longer leads", TimeSpan.FromSeconds(30));
            var before = log.Lines.Count;
            leadership.Set(true, epoch: 1);
            var refused = await PollAsync(async () =>
                log.Lines.Skip(before).Any(l => l.Message.Contains(AuditEvents.RetentionAlarmRaised, StringComparison.Ordinal) && l.Message.Contains("epoch 1", StringComparison.Ordinal))
                || await RaisedAsync(audit) > 1, "the stale run's entry to be refused (or written)");
            Assert.True(refused);
            Assert.Equal(1, await RaisedAsync(audit));
            await Eventually.TrueAsync(() => alarm.Current is null, "the alarm taken down after the refused entry", TimeSpan.FromSeconds(30));

            // 3. leading with the epoch on record, the same path writes the entry again
            leadership.Set(false);
            await Eventually.TrueAsync(() => alarm.Current is null, "the alarm down while standing by", TimeSpan.FromSeconds(30));
            leadership.Set(true, epoch: 2);
            await Eventually.TrueAsync(() => alarm.Current is not null, "the retention alarm with the current epoch", TimeSpan.FromSeconds(60));
            await WaitForRaisedAsync(audit, 2);
            var verification = await audit.VerifyAsync();
            Assert.True(verification.Ok, verification.Detail);
        }
        finally
        {
            OpsLvpApp.TryDelete(shared);
            Directory.Delete(outside, recursive: true);
        }
    }

    private static async Task SetEpochAsync(ProviderDatabase db, long epoch, string node)
    {
        await using var connection = new NpgsqlConnection(db.ConnectionString + ";Pooling=false");
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            "INSERT INTO engine_leadership (id, epoch, node_id, since) VALUES (1, $1, $2, $3) "
            + "ON CONFLICT (id) DO UPDATE SET epoch = excluded.epoch, node_id = excluded.node_id, since = excluded.since", connection);
        command.Parameters.Add(new NpgsqlParameter { Value = epoch });
        command.Parameters.Add(new NpgsqlParameter { Value = node });
        command.Parameters.Add(new NpgsqlParameter { Value = UtcTextConverter.Format(DateTimeOffset.UtcNow) });
        await command.ExecuteNonQueryAsync();
    }

    private static async Task<int> RaisedAsync(AuditStore audit) =>
        (await audit.GetRangeAsync(1, long.MaxValue)).Count(e => e.Kind == AuditEvents.RetentionAlarmRaised);

    /// <summary>Polls (up to 60 s) until there are <paramref name="count"/> retention_alarm_raised entries; fails on more.</summary>
    private static async Task WaitForRaisedAsync(AuditStore audit, int count)
    {
        await PollAsync(async () => await RaisedAsync(audit) >= count, $"{count} retention_alarm_raised entries");
        Assert.Equal(count, await RaisedAsync(audit));
    }

    private static async Task<bool> PollAsync(Func<Task<bool>> condition, string what)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(60);
        while (!await condition())
        {
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"timed out after 60 s waiting for {what}");
            }
            await Task.Delay(100);
        }
        return true;
    }
}
