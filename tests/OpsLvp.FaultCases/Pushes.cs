using System.Globalization;
using System.Net;
using System.Text;

namespace OpsLvp.FaultCases;

/// <summary>
/// Pushes well-formed RVR readings of <see cref="FaultProfile.Tdz"/> with strictly increasing times (one millisecond
/// apart, so each acknowledged reading is named by its time) and keeps the times of every reading answered 202. Values
/// alternate across the thresholds so transitions and dwells are in flight (invented values).
/// </summary>
public sealed class Pushes(DateTimeOffset start)
{
    private readonly object _gate = new();

    private readonly List<DateTimeOffset> _acknowledged = [];

    private long _next;

    private long _refused;

    private long _value;

    /// <summary>The times of the readings the server acknowledged (202).</summary>
    public IReadOnlyList<DateTimeOffset> Acknowledged
    {
        get
        {
            lock (_gate)
            {
                return _acknowledged.ToArray();
            }
        }
    }

    /// <summary>Answers other than 202 (503 while not recording).</summary>
    public long Refused => Interlocked.Read(ref _refused);

    /// <summary>The time of the next reading; every reading after this one is later.</summary>
    public DateTimeOffset Next => start.AddMilliseconds(Interlocked.Read(ref _next));

    /// <summary>Moves the next reading time to at least <paramref name="time"/> (after a restart: near the clock again).</summary>
    public void SkipTo(DateTimeOffset time)
    {
        var ms = (long)(time - start).TotalMilliseconds;
        long current;
        while ((current = Interlocked.Read(ref _next)) < ms && Interlocked.CompareExchange(ref _next, ms, current) != current)
        {
        }
    }

    /// <summary>
    /// One request of <paramref name="count"/> readings. Returns the status, or null when the request failed (the
    /// server died under it: neither acknowledged nor refused). A 202 adds the readings to <see cref="Acknowledged"/>.
    /// </summary>
    public async Task<HttpStatusCode?> PushAsync(HttpClient client, int count, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(client);
        var times = new DateTimeOffset[count];
        var items = new string[count];
        for (var i = 0; i < count; i++)
        {
            var t = start.AddMilliseconds(Interlocked.Increment(ref _next));
            times[i] = t;
            var rvr = (Interlocked.Increment(ref _value) % 3) switch { 0 => 900, 1 => 500, _ => 1500 };
            items[i] = string.Create(CultureInfo.InvariantCulture,
                $"{{\"time\":\"{t.UtcDateTime:yyyy-MM-dd'T'HH:mm:ss.fff'Z'}\",\"sensor\":\"{FaultProfile.Tdz}\",\"kind\":\"rvr\",\"value\":{rvr},\"status\":\"ok\"}}");
        }
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{\"readings\":[" + string.Join(",", items) + "]}", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add("X-Api-Key", FaultProfile.PushKey);
        try
        {
            using var response = await client.SendAsync(request, cancellationToken);
            if (response.StatusCode == HttpStatusCode.Accepted)
            {
                lock (_gate)
                {
                    _acknowledged.AddRange(times);
                }
            }
            else
            {
                Interlocked.Increment(ref _refused);
            }
            return response.StatusCode;
        }
        catch (HttpRequestException)
        {
            return null;
        }
        catch (TaskCanceledException)
        {
            return null;
        }
    }
}
