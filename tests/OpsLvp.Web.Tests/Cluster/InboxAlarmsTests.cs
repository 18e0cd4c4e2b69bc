using OpsLvp.Core.Engine;
using OpsLvp.Web.Cluster;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// The reading inbox's screen alarms (docs/engine.md R81, R82): one alarm each, whose text follows the facts and whose
/// time stays while it shows, so a screen chimes once (AlarmCue chimes per key and time). Invented batch ids and nodes.
/// </summary>
public sealed class InboxAlarmsTests
{
    private static readonly DateTimeOffset At = new(2026, 1, 15, 3, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Behind_IsOneAlarm_WhoseTextFollowsTheCount_KeepsItsTime_AndClears()
    {
        var alarms = new InboxAlarms();
        alarms.Behind(3, At.AddSeconds(-40), "node-b", At);
        alarms.Behind(7, At.AddSeconds(-40), "node-b", At.AddSeconds(5));

        var alarm = Assert.Single(alarms.Current(At.AddSeconds(5)));
        Assert.Equal((InboxAlarms.BehindKey, AlarmKind.InboxBehind, At), (alarm.Key, alarm.Kind, alarm.RaisedAt));
        Assert.StartsWith("7 reading batch(es) pushed to other nodes not yet evaluated, the oldest received on node-b at 02:59:20Z;", alarm.Message, StringComparison.Ordinal);

        alarms.NotBehind();
        Assert.Empty(alarms.Current(At.AddSeconds(6)));
        alarms.Behind(1, At, "node-b", At.AddSeconds(60));
        Assert.Equal(At.AddSeconds(60), Assert.Single(alarms.Current(At.AddSeconds(60))).RaisedAt);

        // a batch received on an earlier day (UTC) names the date too
        alarms.Behind(2, At.AddHours(-4), "node-b", At.AddSeconds(70));
        Assert.StartsWith("2 reading batch(es) pushed to other nodes not yet evaluated, the oldest received on node-b at 2026-01-14 23:00:00Z;", Assert.Single(alarms.Current(At.AddSeconds(70))).Message, StringComparison.Ordinal);
    }

    [Fact]
    public void SetAside_ShowsForThirtyMinutesAfterTheLast_OneAlarmNamingTheLastBatchAndTheCount()
    {
        var alarms = new InboxAlarms();
        alarms.SetAside(41, "node-b", At.AddMinutes(-1), 8, "PostgresException: invented", At);
        alarms.SetAside(42, "node-c", At.AddMinutes(-1), 3, "PostgresException: invented", At.AddMinutes(20));

        var alarm = Assert.Single(alarms.Current(At.AddMinutes(45)));
        Assert.Equal((InboxAlarms.SetAsideKey, AlarmKind.InboxBatchSetAside, At), (alarm.Key, alarm.Kind, alarm.RaisedAt));
        Assert.StartsWith("reading batch 42 received on node-c at 02:59:00Z (3 reading(s)) was set aside and will not be evaluated: PostgresException: invented", alarm.Message, StringComparison.Ordinal);
        Assert.Contains("(2 set aside since this node started)", alarm.Message, StringComparison.Ordinal);
        Assert.Equal(2, alarms.SetAsideCount);

        // 30 minutes after the last one it is no longer shown; a later one raises it afresh (a new chime)
        Assert.Empty(alarms.Current(At.AddMinutes(50)));
        alarms.SetAside(43, "node-b", At.AddMinutes(59), 1, "invented", At.AddMinutes(60));
        Assert.Equal(At.AddMinutes(60), Assert.Single(alarms.Current(At.AddMinutes(60))).RaisedAt);
    }

    [Fact]
    public void DatabaseAndNetworkFailures_AreNotTheBatchsFault_DataAndIntegrityErrorsAndEngineFaultsAre()
    {
        // a connection that failed (Npgsql wraps the socket error), a timeout: no attempt is counted against the batch
        Assert.True(ReadingInboxDrain.IsInfrastructure(new Npgsql.NpgsqlException("invented: connection lost", new System.Net.Sockets.SocketException())));
        Assert.True(ReadingInboxDrain.IsInfrastructure(new InvalidOperationException("invented", new TimeoutException())));
        // the database refusing the batch's rows, and any other fault of its evaluation, are
        Assert.False(ReadingInboxDrain.IsInfrastructure(new OpsLvp.Web.Engine.InboxBatchFaultException("invented", new Npgsql.NpgsqlException("invented"))));
        Assert.False(ReadingInboxDrain.IsInfrastructure(new InvalidOperationException("invented engine fault")));
    }
}
