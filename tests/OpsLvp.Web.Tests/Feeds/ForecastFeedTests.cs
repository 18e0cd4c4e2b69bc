using System.Globalization;
using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>
/// Forecasts into the live engine (docs/feeds.md "TAF feeds", "Forecast push"; docs/engine.md R25–R27): a TAF feed
/// polling a fake upstream on Kestrel 127.0.0.1:0, and POST /api/forecasts. Every TAF and METAR is invented for the
/// invented XTST; the forecast settings (3 h look-ahead, 1000 m, 300 ft) are invented and illustrative.
/// </summary>
public sealed class ForecastFeedTests
{
    private static string Ddhh(DateTimeOffset t) => t.UtcDateTime.ToString("ddHH", CultureInfo.InvariantCulture);

    private static string Ddhhmm(DateTimeOffset t) => t.UtcDateTime.ToString("ddHHmm", CultureInfo.InvariantCulture);

    /// <summary>The live test profile with an invented forecast section.</summary>
    private static string WriteProfile(string folder)
    {
        var path = LiveTestProfile.Write(folder);
        var json = File.ReadAllText(path).Replace("\"confirm\": [],",
            "\"confirm\": [], \"forecast\": { \"horizonMinutes\": 180, \"visibilityBelowM\": 1000, \"ceilingBelowFt\": 300, \"countTempo\": true, \"countProb30\": false, \"countProb40\": true },",
            StringComparison.Ordinal);
        File.WriteAllText(path, json);
        return path;
    }

    /// <summary>A TAF issued now, valid from this hour for 24 h, with TEMPO fog from the next hour for two hours.</summary>
    private static string FogTaf(DateTimeOffset now)
    {
        var hour = new DateTimeOffset(now.Year, now.Month, now.Day, now.Hour, 0, 0, TimeSpan.Zero);
        return $"TAF XTST {Ddhhmm(now)}Z {Ddhh(hour)}/{Ddhh(hour.AddHours(24))} 24005KT 9999 SCT030\n  TEMPO {Ddhh(hour.AddHours(1))}/{Ddhh(hour.AddHours(3))} 0300 FG VV002=";
    }

    private static async Task<(WebApplication App, Uri Url)> StartUpstreamAsync(string text)
    {
        var builder = WebApplication.CreateSlimBuilder();
        builder.Logging.ClearProviders();
        builder.WebHost.UseKestrel(options => options.Listen(IPAddress.Loopback, 0));
        var app = builder.Build();
        app.MapGet("/taf", () => Results.Text(text, "text/plain"));
        await app.StartAsync();
        var address = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.Single();
        return (app, new Uri(new Uri(address), "/taf"));
    }

    [Fact]
    public async Task TafFeed_FogTafSetsTheFlagWithItsSource_MalformedOneIsRejected_AndTheFeedHasItsOwnHealth()
    {
        var folder = OpsLvpApp.NewDataFolder();
        var now = DateTimeOffset.UtcNow;
        var (upstream, url) = await StartUpstreamAsync("TAF XTST 1512=\nthis is not a TAF=\n" + FogTaf(now) + "\n");
        try
        {
            var settings = LiveTestProfile.Settings(WriteProfile(folder));
            settings["Feeds:Taf:0:Name"] = "met";
            settings["Feeds:Taf:0:Source"] = url.ToString();
            settings["Feeds:Taf:0:PollInterval"] = "00:00:00.500";
            await using var app = OpsLvpApp.Start(settings, folder);

            // only the forecast asks for preparation (no readings at all; preparation dwell 0 in the test profile)
            var state = await LiveClient.WaitForPhaseAsync(app, "preparation", TimeSpan.FromSeconds(60));
            var status = state.GetProperty("status");
            Assert.True(status.GetProperty("deteriorationForecast").GetBoolean());
            var source = status.GetProperty("forecast").GetProperty("source");
            var hour = new DateTimeOffset(now.Year, now.Month, now.Day, now.Hour, 0, 0, TimeSpan.Zero);
            Assert.Equal($"TAF {hour.AddHours(1):HHmm}–{hour.AddHours(3):HHmm} TEMPO 0300 FG VV002", source.GetProperty("shortForm").GetString());
            Assert.StartsWith("TAF XTST", source.GetProperty("reportText").GetString(), StringComparison.Ordinal);

            var feed = await PollAsync(() => app.GetFeedHealthAsync("taf:met"), f => f.GetProperty("lastRejected").GetInt32() == 2, "TAF feed health with its two rejections");
            Assert.Equal("taf", feed.GetProperty("kind").GetString());
            Assert.Equal(1, feed.GetProperty("lastAccepted").GetInt32());

            var kinds = (await LiveClient.EntriesAsync(app)).Select(e => e.Kind).ToList();
            Assert.Single(kinds, k => k == "forecast_received"); // polled again and again, received once
            Assert.Contains("forecast_flag_changed", kinds);
            await LiveClient.AssertChainVerifiesAsync(app);
        }
        finally
        {
            await upstream.DisposeAsync();
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static async Task<JsonElement> PostForecastsAsync(OpsLvpApp app, string body, HttpStatusCode expected = HttpStatusCode.Accepted)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/forecasts", UriKind.Relative))
        {
            Content = new StringContent(body, Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        Assert.Equal(expected, response.StatusCode);
        return await response.Content.ReadFromJsonAsync<JsonElement>();
    }

    [Fact]
    public async Task Push_TrendSetsTheFlag_BadItemsAreRejectedWithAReason_AndANewerNosigClearsIt()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(WriteProfile(folder)), folder);
            var now = DateTimeOffset.UtcNow;
            var fog = $"METAR XTST {Ddhhmm(now)}Z 24004KT 4000 BR SCT030 08/07 Q1020 TEMPO 0400 FG";
            var body = await PostForecastsAsync(app, $$"""
                { "forecasts": [
                    { "type": "metar", "text": "{{fog}}" },
                    { "type": "taf", "text": "TAF XTST" },
                    { "type": "metar", "text": "METAR XTST {{Ddhhmm(now)}}Z 24004KT 9999 SCT030 08/07 Q1020" },
                    { "type": "speci" }
                ] }
                """);
            Assert.Equal(1, body.GetProperty("accepted").GetInt32());
            var rejected = body.GetProperty("rejected").EnumerateArray().ToList();
            Assert.Equal([1, 2, 3], rejected.Select(r => r.GetProperty("index").GetInt32()));
            Assert.Contains("TAF not decoded", rejected[0].GetProperty("detail").GetString(), StringComparison.Ordinal);
            Assert.Equal("the report has no TREND", rejected[1].GetProperty("detail").GetString());

            var on = await LiveClient.WaitForPhaseAsync(app, "preparation", TimeSpan.FromSeconds(60));
            Assert.Equal("trend", on.GetProperty("status").GetProperty("forecast").GetProperty("source").GetProperty("origin").GetString());

            var later = now.AddMinutes(1);
            await PostForecastsAsync(app, $$"""{ "forecasts": [ { "type": "metar", "text": "METAR XTST {{Ddhhmm(later)}}Z 24004KT 9999 SCT030 08/07 Q1020 NOSIG" } ] }""");
            await PollAsync(() => LiveClient.StateAsync(app), s => !s.GetProperty("status").GetProperty("deteriorationForecast").GetBoolean(), "flag off after the newer NOSIG trend");

            using var notJson = await PostRawAsync(app, "not json");
            Assert.Equal(HttpStatusCode.BadRequest, notJson.StatusCode);
            var health = await LiveClient.StateAsync(app); // the server keeps running
            Assert.False(health.GetProperty("status").GetProperty("deteriorationForecast").GetBoolean());
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    /// <summary>Polls until <paramref name="done"/> holds, with a generous 60 s ceiling.</summary>
    private static async Task<JsonElement> PollAsync(Func<Task<JsonElement>> probe, Func<JsonElement, bool> done, string what)
    {
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(60);
        while (true)
        {
            var value = await probe();
            if (done(value))
            {
                return value;
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"timed out waiting for {what}; last: {value}");
            }
            await Task.Delay(100);
        }
    }

    private static Task<HttpResponseMessage> PostRawAsync(OpsLvpApp app, string body)
    {
        var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/forecasts", UriKind.Relative))
        {
            Content = new StringContent(body, Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        return app.Client.SendAsync(request);
    }

    [Fact]
    public void Split_TakesEqualsSignsOrTafLines()
    {
        Assert.Equal(["TAF XTST 150500Z 1506/1606 9999 SCT030 TEMPO 1507/1509 0300 FG", "TAF XOTH 150500Z 1506/1606 CAVOK"],
            TafFeedPoller.Split("# invented\nTAF XTST 150500Z 1506/1606 9999 SCT030\n   TEMPO 1507/1509 0300 FG=\nTAF XOTH 150500Z 1506/1606 CAVOK=\n"));
        Assert.Equal(["TAF XTST 150500Z 1506/1606 9999 SCT030 BECMG 1507/1509 0300 FG", "TAF AMD XTST 150600Z 1506/1606 CAVOK"],
            TafFeedPoller.Split("TAF XTST 150500Z 1506/1606 9999 SCT030\nBECMG 1507/1509 0300 FG\n\nTAF AMD XTST 150600Z 1506/1606 CAVOK\n"));
        Assert.Equal(["XTST 150500Z 1506/1606 CAVOK", "XTST 150600Z 1506/1606 9999 NSC"],
            TafFeedPoller.Split("XTST 150500Z 1506/1606 CAVOK\nXTST 150600Z 1506/1606 9999 NSC\n"));
    }

    [Fact]
    public void MetarFeed_TrendOfEachReport_BecomesAForecastInput()
    {
        var now = new DateTimeOffset(2026, 1, 15, 4, 10, 0, TimeSpan.Zero);
        var batch = MetarFeedPoller.ToBatch(
            "METAR XTST 150400Z 00000KT 3000 BR SCT010 03/03 Q1021 TEMPO FM0430 0300 FG=\nMETAR XTST 150405Z 00000KT 3000 BR SCT010 03/03 Q1021=\n",
            new MetarFeedOptions { Name = "unit" }, now);
        var forecast = Assert.Single(batch.Forecasts);
        Assert.Equal(ForecastOrigin.Trend, forecast.Origin);
        Assert.Equal("METAR XTST 150400Z 00000KT 3000 BR SCT010 03/03 Q1021 TEMPO FM0430 0300 FG", forecast.Text);
        Assert.Equal(now, forecast.ReceivedAt);
    }

    [Fact]
    public void TafToBatch_GivesForecastInputs_AndMalformedRejections()
    {
        var now = new DateTimeOffset(2026, 1, 15, 4, 10, 0, TimeSpan.Zero);
        var batch = TafFeedPoller.ToBatch("TAF XTST 150400Z 1505/1605 9999 SCT030=\nTAF XTST 150400Z=\n", "taf:unit", now);
        Assert.Equal([new ForecastInput(ForecastOrigin.Taf, "TAF XTST 150400Z 1505/1605 9999 SCT030", now)], batch.Forecasts);
        var rejection = Assert.Single(batch.Rejections);
        Assert.Equal(RejectReason.Malformed, rejection.Reason);
        Assert.StartsWith("TAF not decoded", rejection.Detail, StringComparison.Ordinal);
        Assert.Empty(batch.Readings);
    }
}
