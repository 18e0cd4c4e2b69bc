using System.Globalization;
using System.Net.Http.Json;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Access;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// Keeps every sensor of the demo profile reporting invented fair-weather values to a <see cref="BenchServer"/>
/// through POST /api/readings (one batch every <see cref="Interval"/>), so a page measured on it shows a full
/// aerodrome with fresh readings rather than an empty one. Values per sensor type in the units of docs/feeds.md.
/// </summary>
public sealed class BenchSensorFeed : IAsyncDisposable
{
    public static readonly TimeSpan Interval = TimeSpan.FromSeconds(10);

    private readonly CancellationTokenSource _stop = new();
    private readonly HttpClient _http;
    private readonly Task _loop;

    private BenchSensorFeed(HttpClient http, Task first, Func<CancellationToken, Task> post)
    {
        _http = http;
        _loop = LoopAsync(first, post);
    }

    /// <summary>Posts the first batch (and waits for it to be accepted), then keeps posting in the background.</summary>
    public static async Task<BenchSensorFeed> StartAsync(BenchServer server, AerodromeProfile profile)
    {
        var key = await server.IssuePushKeyAsync();
        var http = new HttpClient { BaseAddress = server.BaseAddress, Timeout = TimeSpan.FromSeconds(20) };
        async Task PostAsync(CancellationToken cancellationToken)
        {
            var now = TimeProvider.System.GetUtcNow().ToString("O", CultureInfo.InvariantCulture);
            var body = new
            {
                readings = profile.Sensors.SelectMany(s => Readings(s.Type).Select(r => new { time = now, sensor = s.Id, kind = r.Kind, value = r.Value, status = "ok" })).ToList(),
            };
            using var request = new HttpRequestMessage(HttpMethod.Post, "/api/readings") { Content = JsonContent.Create(body) };
            request.Headers.Add(ApiKeyAuthenticationHandler.Header, key);
            using var response = await http.SendAsync(request, cancellationToken);
            response.EnsureSuccessStatusCode();
        }
        var first = PostAsync(CancellationToken.None);
        await first;
        return new BenchSensorFeed(http, first, PostAsync);
    }

    public async ValueTask DisposeAsync()
    {
        await _stop.CancelAsync();
        try
        {
            await _loop;
        }
        catch (OperationCanceledException)
        {
        }
        _http.Dispose();
        _stop.Dispose();
    }

    private async Task LoopAsync(Task first, Func<CancellationToken, Task> post)
    {
        await first;
        while (!_stop.IsCancellationRequested)
        {
            await Task.Delay(Interval, _stop.Token);
            await post(_stop.Token);
        }
    }

    private static IEnumerable<(string Kind, double Value)> Readings(SensorType type) => type switch
    {
        SensorType.Transmissometer => [("transmittance", 0.95)],
        SensorType.ForwardScatter => [("extinction", 1.5)],
        SensorType.RvrSystem => [("rvr", 1500)],
        SensorType.Ceilometer => [("cloud_base", 1500)],
        SensorType.Visibility => [("visibility", 5000)],
        SensorType.Luminance => [("background_luminance", 1000)],
        _ => [],
    };
}
