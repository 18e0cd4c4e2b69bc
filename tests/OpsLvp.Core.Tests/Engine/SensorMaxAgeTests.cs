using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using static OpsLvp.Core.Tests.Engine.EngineDriver;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R21: <c>sensors[].maxAgeSeconds</c> overrides the per-kind maximum age (invented test profile:
/// cloud base 300 s per kind; CEIL1 given 1800 s, as a half-hourly METAR source would need).
/// </summary>
public sealed class SensorMaxAgeTests
{
    private static AerodromeProfile HalfHourlyCeilometer() => TestProfiles.Standard() with
    {
        Sensors = TestProfiles.Standard().Sensors.Select(s => s.Id == "CEIL1" ? s with { MaxAgeSeconds = 1800 } : s).ToList(),
    };

    private static void GoodRvrEveryMinute(EngineDriver d, double from, double to)
    {
        for (var t = from; t <= to; t += 60)
        {
            d.Run(t, [.. TestProfiles.GoverningRvr.Select(s => Rvr(t, s, 1500))]);
        }
    }

    [Fact]
    public void SensorsOwnMaximumAge_KeepsItsReadingFreshPastTheKindsAge()
    {
        var d = new EngineDriver(HalfHourlyCeilometer());
        d.Weather(0, 1500, ceilingFt: 5000);
        GoodRvrEveryMinute(d, 60, 1740);
        Assert.DoesNotContain(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == "feed-silent:CEIL1");
        Assert.DoesNotContain(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == "ceiling-unknown" && a.Alarm.RaisedAt > At(0));
        // the 1800 s age ends at 1800 s exactly (fresh until, exclusive, time + maximum age: docs/engine.md R2)
        d.Run(1800, [.. TestProfiles.GoverningRvr.Select(s => Rvr(1800, s, 1500))]);
        Assert.Contains(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == "feed-silent:CEIL1" && a.Alarm.RaisedAt == At(1800));
    }

    [Fact]
    public void WithoutTheSensorsOwnAge_TheKindsAgeApplies()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500, ceilingFt: 5000);
        GoodRvrEveryMinute(d, 60, 600);
        Assert.Contains(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == "feed-silent:CEIL1" && a.Alarm.RaisedAt == At(300));
    }

    [Fact]
    public void SensorsOwnMaximumAge_AlsoBoundsAFastSensorBelowTheKindsAge()
    {
        var profile = TestProfiles.Standard() with
        {
            Sensors = TestProfiles.Standard().Sensors.Select(s => s.Id == "RVR07T" ? s with { MaxAgeSeconds = 15 } : s).ToList(),
        };
        var d = new EngineDriver(profile);
        d.Weather(0, 1500);
        d.Run(30);
        Assert.Contains(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == "feed-silent:RVR07T" && a.Alarm.RaisedAt == At(15));
        Assert.DoesNotContain(d.Events.OfType<AlarmRaised>(), a => a.Alarm.Key == "feed-silent:RVR07M");
    }
}
