using OpsLvp.Core.Engine;
using static OpsLvp.Core.Tests.Engine.EngineDriver;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md "Alarms": raised on cause, cleared automatically when it ends, acknowledged by command.</summary>
public class AlarmTests
{
    [Fact]
    public void AtStart_GoverningRvrAndCeilingUnknown_AreRaised_AndClearedByFreshReadings()
    {
        var d = new EngineDriver();
        d.Run(0);
        Assert.Equal(["rvr-unknown", "ceiling-unknown"], d.Events.OfType<AlarmRaised>().Select(a => a.Alarm.Key));
        d.Weather(10, 1500);
        Assert.Equal(["rvr-unknown", "ceiling-unknown"], d.Events.OfType<AlarmCleared>().Select(a => a.Key));
    }

    [Fact]
    public void CeilingUnknown_IsNotRaisedWithoutCeilometers()
    {
        var d = new EngineDriver(TestProfiles.WithoutCeilometer());
        d.Run(0);
        Assert.DoesNotContain(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Kind == AlarmKind.CeilingUnknown);
    }

    [Fact]
    public void SilentSensor_IsRaisedAtTheExactStaleInstant()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        d.Run(60, Rvr(60, "RVR07T", 1500), Rvr(60, "RVR07M", 1500));
        d.Run(300);
        var raised = Assert.Single(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == "feed-silent:RVR25T");
        Assert.Equal(At(120), raised.At); // reading at 0 s + max age 120 s (invented)
    }

    [Fact]
    public void Acknowledge_KeepsTheAlarmUntilItsCauseEnds_AndASecondAckIsRefused()
    {
        var d = new EngineDriver();
        d.Run(0);
        var events = d.Run(5, new AcknowledgeAlarm("dm (invented)", "rvr-unknown"), new AcknowledgeAlarm("dm2 (invented)", "rvr-unknown"));
        Assert.Single(events.OfType<AlarmAcknowledged>());
        Assert.StartsWith("alarm 'rvr-unknown' already acknowledged by dm (invented)", Assert.Single(events.OfType<CommandRefused>()).Reason);
        Assert.True(d.State.Alarms.Single(a => a.Key == "rvr-unknown").Acknowledged);
        d.Weather(10, 1500);
        Assert.DoesNotContain(d.State.Alarms, a => a.Key == "rvr-unknown");
    }

    [Fact]
    public void Acknowledge_OfAnAlarmNotRaised_IsRefused()
    {
        var d = new EngineDriver();
        Assert.Equal("no raised alarm 'nope'", Assert.Single(d.Run(5, new AcknowledgeAlarm("dm (invented)", "nope")).OfType<CommandRefused>()).Reason);
    }
}
