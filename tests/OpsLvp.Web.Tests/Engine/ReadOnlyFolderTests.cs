using System.Net;
using System.Text;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.FaultCases;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// The data folder turns read-only under the running app (a read-only bind mount over it), then writable again
/// (docs/reliability.md "Storage faults"). Readings are invented.
/// </summary>
public sealed class ReadOnlyFolderTests
{
    /// <remarks>
    /// Files the server already holds open stay writable through their descriptors, so its long-lived writer
    /// connections may keep recording (durably: the filesystem underneath is writable) while every new connection
    /// opens read-only. The run lost the process to SIGBUS within a second; this checks it survives, answers
    /// every push with 202 (stored) or 503 (not stored) and nothing else, loses nothing it acknowledged, and records
    /// again once the folder is writable.
    /// </remarks>
    [RootFact]
    public async Task ReadOnlyDataFolder_TheServerSurvives_AnswersEveryPush202Or503_AndLosesNothingAcknowledged()
    {
        using var fs = SmallMount.Mount(OpsLvpApp.NewDataFolder(), 32);
        var profile = LiveTestProfile.Write(fs.Root);
        await using var app = OpsLvpApp.Start(LiveTestProfile.Settings(profile), fs.Root);
        await LiveClient.ReaderKeyAsync(app);
        var acknowledged = new List<DateTimeOffset>();
        var t = DateTimeOffset.FromUnixTimeMilliseconds(DateTimeOffset.UtcNow.AddSeconds(-60).ToUnixTimeMilliseconds());
        Assert.Equal(HttpStatusCode.Accepted, await PushAsync(app, t = t.AddMilliseconds(500), acknowledged));

        fs.SetReadOnly();
        for (var i = 0; i < 40; i++)
        {
            var status = await PushAsync(app, t = t.AddMilliseconds(500), acknowledged);
            Assert.True(status is HttpStatusCode.Accepted or HttpStatusCode.ServiceUnavailable, $"push answered {(int)status}");
            var health = await app.GetHealthAsync(); // the server still answers
            Assert.True(health.GetProperty("status").GetString() is "ok" or "failing");
            await Task.Delay(100);
        }

        fs.SetWritable();
        var deadline = DateTime.UtcNow.AddSeconds(60);
        while (await PushAsync(app, t = t.AddMilliseconds(500), acknowledged) != HttpStatusCode.Accepted)
        {
            Assert.True(DateTime.UtcNow < deadline, "recording did not resume within 60 s of the folder turning writable");
            await Task.Delay(200);
        }
        Assert.Equal("ok", (await app.GetHealthAsync()).GetProperty("status").GetString());
        var stored = (await app.Services.GetRequiredService<ReadingStore>().GetReceivedAsync(DateTimeOffset.UnixEpoch, DateTimeOffset.UtcNow.AddDays(1)))
            .Where(r => r.Sensor == LiveTestProfile.Tdz && r.Time is not null)
            .Select(r => r.Time!.Value)
            .ToHashSet();
        Assert.All(acknowledged, a => Assert.Contains(a, stored));
        await LiveClient.AssertChainVerifiesAsync(app);
    }

    private static async Task<HttpStatusCode> PushAsync(OpsLvpApp app, DateTimeOffset t, List<DateTimeOffset> acknowledged)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + LiveClient.Item(t, LiveTestProfile.Tdz, "rvr", 1500) + "] }", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        if (response.StatusCode == HttpStatusCode.Accepted)
        {
            acknowledged.Add(t);
        }
        return response.StatusCode;
    }
}
