using System.Globalization;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Live;

/// <summary>The METAR/SPECI text feed into the live engine. Reports are invented, for the invented XTST.</summary>
public sealed class MetarFeedTests
{
    private static string Report(DateTimeOffset t, string body) =>
        $"METAR XTST {t.UtcDateTime.ToString("ddHHmm", CultureInfo.InvariantCulture)}Z {body}";

    [Fact]
    public async Task MetarFile_RvrGroupReachesTheEngine_AndTheFeedIsHealthy()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var file = Path.Combine(folder, "station.metar");
            Directory.CreateDirectory(folder);
            // R09/0350N: RVR 350 m on runway 09, no change (WMO-No. 306 FM 15 group, decoded by Core's MetarDecoder)
            await File.WriteAllTextAsync(file, "not a report\n" + Report(DateTimeOffset.UtcNow, "00000KT 0400 R09/0350N FG VV001 02/02 Q1020=") + "\n");
            var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
            settings["Feeds:Metar:0:Name"] = "test";
            settings["Feeds:Metar:0:Source"] = file;
            settings["Feeds:Metar:0:PollInterval"] = "00:00:00.500";
            settings["Feeds:Metar:0:RvrSensorByRunway:09"] = LiveTestProfile.Tdz;
            await using var app = OpsLvpApp.Start(settings, folder);

            var state = await LiveClient.WaitForPhaseAsync(app, "active");
            var rvr = state.GetProperty("status").GetProperty("governingRvr");
            Assert.Equal(350, rvr.GetProperty("value").GetDouble());
            var feed = await app.GetFeedHealthAsync("metar:test");
            Assert.Equal("metar", feed.GetProperty("kind").GetString());
            Assert.Equal(1, feed.GetProperty("lastRejected").GetInt32());
            await LiveClient.AssertChainVerifiesAsync(app);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public void ToBatch_GivesReadingsPerDecodedLine_AndAMalformedRejectionPerBadLine()
    {
        var now = new DateTimeOffset(2026, 1, 15, 4, 10, 0, TimeSpan.Zero);
        var feed = new MetarFeedOptions
        {
            Name = "unit",
            RvrSensorByRunway = new Dictionary<string, string> { ["09"] = "r09" },
            VisibilitySensorId = "vis",
            CloudBaseSensorId = "ceil",
        };
        var batch = MetarFeedPoller.ToBatch(
            "METAR XTST 150400Z 00000KT 0800 R09/0600D BR BKN002 03/03 Q1021=\n\nMETAR XTST 15040\n",
            feed,
            now);
        Assert.Equal("metar:unit", batch.Source);
        var at = new DateTimeOffset(2026, 1, 15, 4, 0, 0, TimeSpan.Zero);
        Assert.Contains(new Reading(at, "r09", ReadingKind.Rvr, 600), batch.Readings);
        Assert.Contains(new Reading(at, "vis", ReadingKind.Visibility, 800), batch.Readings);
        // BKN002: ceiling 200 ft (ICAO Annex 3 / WMO-No. 306 cloud group, hundreds of feet)
        Assert.Contains(new Reading(at, "ceil", ReadingKind.CloudBase, 200), batch.Readings);
        var rejection = Assert.Single(batch.Rejections);
        Assert.Equal(RejectReason.Malformed, rejection.Reason);
    }

    [Fact]
    public void ToBatch_UnknownCeiling_GivesNoCeilingReadingThatCouldRelax_EvenWithAClearValueConfigured()
    {
        // docs/engine.md R24: BKN/// (height not determinable) could lie below OVC030; VV/// is sky obscured, height unknown
        var now = new DateTimeOffset(2026, 1, 15, 4, 10, 0, TimeSpan.Zero);
        var feed = new MetarFeedOptions
        {
            Name = "unit",
            CloudBaseSensorId = "ceil",
            VerticalVisibilitySensorId = "ceil",
            NoCeilingCloudBaseFeet = 20_000,
        };
        var batch = MetarFeedPoller.ToBatch(
            "METAR XTST 150400Z 00000KT 0800 BR BKN/// OVC030 03/03 Q1021=\nMETAR XTST 150405Z 00000KT 0200 FG VV/// 03/03 Q1021=\n",
            feed,
            now);
        Assert.DoesNotContain(batch.Readings, r => r.Kind is ReadingKind.CloudBase or ReadingKind.VerticalVisibility);
        Assert.Empty(batch.Rejections);
    }

    [Fact]
    public void ToBatch_VisibilityAtLeast1500WithoutRvrGroup_GivesRvr1500OrMore()
    {
        // docs/engine.md R22; RVR reported when visibility or RVR below 1500 m (from memory, docs/sources.md)
        var now = new DateTimeOffset(2026, 1, 15, 4, 10, 0, TimeSpan.Zero);
        var feed = new MetarFeedOptions { Name = "unit", RvrSensorByRunway = new Dictionary<string, string> { ["09"] = "r09" } };
        var batch = MetarFeedPoller.ToBatch("METAR XTST 150400Z 00000KT 6000 BR SCT010 03/03 Q1021=\n", feed, now);
        var at = new DateTimeOffset(2026, 1, 15, 4, 0, 0, TimeSpan.Zero);
        Assert.Equal([new Reading(at, "r09", ReadingKind.Rvr, 1500, Flags: ReadingFlags.OrMore)], batch.Readings);
    }
}
