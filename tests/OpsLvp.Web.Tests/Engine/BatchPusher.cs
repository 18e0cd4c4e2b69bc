using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// Pushes batches of RVR readings of the live test profile's TDZ sensor with increasing sensor times (whole
/// milliseconds, as stored) and keeps the times of every acknowledged reading, for the storage fault tests. Values are
/// invented, all above the thresholds.
/// </summary>
internal sealed class BatchPusher(OpsLvpApp app, DateTimeOffset start, int batchSize)
{
    private DateTimeOffset _t = DateTimeOffset.FromUnixTimeMilliseconds(start.ToUnixTimeMilliseconds());

    public List<DateTimeOffset> Acknowledged { get; } = [];

    /// <summary>Answers other than 202.</summary>
    public int Refused { get; private set; }

    /// <summary>One batch; the status and, when it is not 202, the body's <c>error</c>.</summary>
    public async Task<(HttpStatusCode Status, string? Error)> PushBatchAsync()
    {
        var times = new List<DateTimeOffset>(batchSize);
        var items = new List<string>(batchSize);
        for (var i = 0; i < batchSize; i++)
        {
            _t = _t.AddMilliseconds(1);
            times.Add(_t);
            items.Add(LiveClient.Item(_t, LiveTestProfile.Tdz, "rvr", 1500 + (i % 7)));
        }
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + string.Join(",", items) + "] }", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        if (response.StatusCode == HttpStatusCode.Accepted)
        {
            Acknowledged.AddRange(times);
            return (response.StatusCode, null);
        }
        Refused++;
        var body = await response.Content.ReadFromJsonAsync<JsonElement>();
        return (response.StatusCode, body.TryGetProperty("error", out var e) ? e.GetString() : body.ToString());
    }

    /// <summary>Pushes until a batch is answered 202 (within 60 s, polled).</summary>
    public async Task PushUntilAcceptedAsync(string what)
    {
        var deadline = DateTime.UtcNow.AddSeconds(60);
        while ((await PushBatchAsync()).Status != HttpStatusCode.Accepted)
        {
            Assert.True(DateTime.UtcNow < deadline, $"recording did not resume within 60 s of {what}");
            await Task.Delay(200);
        }
    }

    /// <summary>The acknowledged readings that are not in the readings table.</summary>
    public async Task<List<DateTimeOffset>> LostAsync()
    {
        var stored = (await app.Services.GetRequiredService<ReadingStore>().GetReceivedAsync(DateTimeOffset.UnixEpoch, DateTimeOffset.UtcNow.AddDays(1)))
            .Where(r => r.Sensor == LiveTestProfile.Tdz && r.Time is not null)
            .Select(r => r.Time!.Value)
            .ToHashSet();
        return Acknowledged.Where(a => !stored.Contains(a)).ToList();
    }
}
