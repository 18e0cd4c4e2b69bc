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
        Assert.DoesNotContain(r.ToReadings(s_at, s_map), x => x.Kind == ReadingKind.CloudBase);
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

    // --- docs/engine.md R22: RVR is reported when visibility or RVR is below 1500 m (from memory, docs/sources.md "Runway
    // visual range"), so a report with visibility of 1500 m or more and no RVR group says "RVR 1500 m or more".

    [Fact]
    public void Readings_VisibilityAtLeast1500AndNoRvrGroup_GiveRvr1500OrMoreForEveryMappedRunway()
    {
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 1500 BR SCT010 08/07 Q1021");
        var rvr = r.ToReadings(s_at, s_map).Where(x => x.Kind == ReadingKind.Rvr).ToList();
        Assert.Equal(
            [
                new Reading(s_at, "METAR-RVR-08", ReadingKind.Rvr, 1500, Flags: ReadingFlags.OrMore),
                new Reading(s_at, "METAR-RVR-26L", ReadingKind.Rvr, 1500, Flags: ReadingFlags.OrMore),
                new Reading(s_at, "METAR-RVR-26R", ReadingKind.Rvr, 1500, Flags: ReadingFlags.OrMore),
            ],
            rvr);
    }

    [Fact]
    public void Readings_RunwayWithItsOwnGroup_KeepsTheReportedValueOnly()
    {
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 2000 R26L/1800N BR 08/07 Q1021");
        var rvr = r.ToReadings(s_at, s_map).Where(x => x.Kind == ReadingKind.Rvr).ToList();
        Assert.Contains(new Reading(s_at, "METAR-RVR-26L", ReadingKind.Rvr, 1800), rvr);
        Assert.Single(rvr, x => x.SensorId == "METAR-RVR-26L");
        Assert.Equal(2, rvr.Count(x => x.Flags == ReadingFlags.OrMore));
    }

    [Theory]
    // visibility below 1500 m: RVR should have been reported, its absence says nothing
    [InlineData("1400 BR SCT010")]
    // a minimum visibility below 1500 m in some direction
    [InlineData("3000 1400NE BR SCT010")]
    // RVRNO: RVR should be reported but is not available (FAA FMH-1 — from memory)
    [InlineData("5000 RVRNO BR SCT010")]
    // visibility not observed or unreadable
    [InlineData("//// BR SCT010")]
    [InlineData("04O0 BR SCT010")]
    // "less than 1 statute mile" (1609 m): the true value may be below 1500 m
    [InlineData("M1SM BR SCT010")]
    public void Readings_NoRvr1500OrMore_WhenTheReportDoesNotShowRvrWasNotRequired(string groups)
    {
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT " + groups);
        Assert.DoesNotContain(r.ToReadings(s_at, s_map), x => x.Kind == ReadingKind.Rvr);
    }

    [Fact]
    public void Readings_StatuteMileVisibility_CountsInMetres()
    {
        // 1 statute mile = 1609.344 m (the international mile): 1SM is at least 1500 m
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 1SM BR SCT010 08/07 A3012");
        var readings = r.ToReadings(s_at, s_map);
        Assert.Contains(new Reading(s_at, "METAR-VIS", ReadingKind.Visibility, 1609), readings);
        Assert.Equal(3, readings.Count(x => x.Kind == ReadingKind.Rvr && x.Flags == ReadingFlags.OrMore));
    }

    // --- docs/engine.md R24: an unknown ceiling gives nothing that could satisfy recovery

    [Theory]
    [InlineData("0300 FG BKN/// OVC030")]
    [InlineData("0300 FG ///002 OVC030")]
    [InlineData("0300 FG //////CB OVC030")]
    [InlineData("0300 FG ////// VV005")]
    public void Readings_CeilingUnknown_GiveNoCloudBaseOrVerticalVisibility(string groups)
    {
        var clear = s_map with { NoCeilingCloudBaseFeet = 20_000 };
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT " + groups);
        Assert.Equal(CeilingStatus.Unknown, r.CeilingStatus);
        Assert.DoesNotContain(r.ToReadings(s_at, clear), x => x.Kind is ReadingKind.CloudBase or ReadingKind.VerticalVisibility);
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
