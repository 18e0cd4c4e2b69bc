using OpsLvp.Core.Metar;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>Turning a decoded report into Core readings for the server's METAR feed. Sensor ids are invented.</summary>
public sealed class MetarReadingsTests
{
    private static readonly DateTimeOffset s_at = new(2026, 12, 1, 6, 20, 0, TimeSpan.Zero);

    private static readonly MetarSensorMap s_map = new(
        new Dictionary<string, string> { ["26L"] = "METAR-RVR-26L", ["26R"] = "METAR-RVR-26R", ["08"] = "METAR-RVR-08" },
        VisibilitySensorId: "METAR-VIS",
        CloudBaseSensorId: "METAR-CLOUD",
        VerticalVisibilitySensorId: "METAR-VV");

    [Fact]
    public void Readings_RvrPerMappedRunwayVisibilityCeilingLayerAndVerticalVisibility()
    {
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 0400 R26L/0550N R26R/0400V0800U R33/0600N FG SCT001 BKN002 OVC004 08/08 Q1021");
        var readings = r.ToReadings(s_at, s_map);
        Assert.Equal(
            [
                new Reading(s_at, "METAR-RVR-26L", ReadingKind.Rvr, 550),
                // varying: the one-minute minimum (WMO-No. 306 FM 15), the conservative value for LVP
                new Reading(s_at, "METAR-RVR-26R", ReadingKind.Rvr, 400),
                new Reading(s_at, "METAR-VIS", ReadingKind.Visibility, 400),
                // ceiling layer = lowest BKN/OVC (ICAO/EASA definition), not the SCT001 below it
                new Reading(s_at, "METAR-CLOUD", ReadingKind.CloudBase, 200),
            ],
            readings);
    }

    [Fact]
    public void Readings_VerticalVisibilityAndLimitValues()
    {
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 0100 R26L/M0050 R08/P2000 FG VV001");
        Assert.Equal(
            [
                new Reading(s_at, "METAR-RVR-26L", ReadingKind.Rvr, 50),
                new Reading(s_at, "METAR-RVR-08", ReadingKind.Rvr, 2000),
                new Reading(s_at, "METAR-VIS", ReadingKind.Visibility, 100),
                new Reading(s_at, "METAR-VV", ReadingKind.VerticalVisibility, 100),
            ],
            r.ToReadings(s_at, s_map));
    }

    [Fact]
    public void Readings_MissingRvrAndNilGiveNothing()
    {
        var missing = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT //// R26L///// VV///");
        Assert.Empty(missing.ToReadings(s_at, s_map));
        Assert.Empty(MetarDecoder.Decode("METAR XDMO 010620Z NIL").ToReadings(s_at, s_map));
    }

    [Fact]
    public void Readings_NoCeilingGivesConfiguredClearValueOnlyWhenAsked()
    {
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT CAVOK 12/05 Q1018");
        Assert.Equal([new Reading(s_at, "METAR-VIS", ReadingKind.Visibility, 10_000)], r.ToReadings(s_at, s_map));
        var clear = s_map with { NoCeilingCloudBaseFeet = 20_000 };
        Assert.Contains(new Reading(s_at, "METAR-CLOUD", ReadingKind.CloudBase, 20_000), r.ToReadings(s_at, clear));
    }

    [Fact]
    public void Readings_ObscuredSkyWithoutValue_GetsNoClearValue()
    {
        var clear = s_map with { NoCeilingCloudBaseFeet = 20_000 };
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 0100 FG VV///");
        Assert.DoesNotContain(r.ToReadings(s_at, clear), x => x.Kind == ReadingKind.CloudBase);
    }

    [Fact]
    public void ObservationTime_ResolvesWithinTheCurrentMonth()
    {
        var t = new MetarObservationTime(1, 6, 20);
        Assert.Equal(new DateTimeOffset(2026, 12, 1, 6, 20, 0, TimeSpan.Zero), t.ResolveNear(new DateTimeOffset(2026, 12, 1, 6, 27, 0, TimeSpan.Zero)));
    }

    [Fact]
    public void ObservationTime_LastDayOfPreviousMonth_ResolvesAcrossMonthEnd()
    {
        var t = new MetarObservationTime(30, 23, 50);
        Assert.Equal(new DateTimeOffset(2026, 11, 30, 23, 50, 0, TimeSpan.Zero), t.ResolveNear(new DateTimeOffset(2026, 12, 1, 0, 5, 0, TimeSpan.Zero)));
    }

    [Fact]
    public void ObservationTime_Day31_SkipsMonthsWithout31Days()
    {
        // 31 November does not exist, so on 1 December the latest 31st is 31 October.
        var t = new MetarObservationTime(31, 12, 0);
        Assert.Equal(new DateTimeOffset(2026, 10, 31, 12, 0, 0, TimeSpan.Zero), t.ResolveNear(new DateTimeOffset(2026, 12, 1, 12, 0, 0, TimeSpan.Zero)));
    }

    [Fact]
    public void ObservationTime_SlightlyAheadOfReceiverClock_StaysInTheSameDay()
    {
        var t = new MetarObservationTime(1, 6, 20);
        var now = new DateTimeOffset(2026, 12, 1, 6, 15, 0, TimeSpan.Zero);
        Assert.Equal(new DateTimeOffset(2026, 12, 1, 6, 20, 0, TimeSpan.Zero), t.ResolveNear(now));
        // Beyond the skew it must be last month's report.
        Assert.Equal(new DateTimeOffset(2026, 11, 1, 6, 20, 0, TimeSpan.Zero), t.ResolveNear(now, TimeSpan.FromMinutes(1)));
    }

    [Fact]
    public void ObservationTime_OutOfRange_IsRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => new MetarObservationTime(0, 6, 20));
        Assert.Throws<ArgumentOutOfRangeException>(() => new MetarObservationTime(1, 24, 0));
        Assert.Throws<ArgumentOutOfRangeException>(() => new MetarObservationTime(1, 6, 60));
    }
}
