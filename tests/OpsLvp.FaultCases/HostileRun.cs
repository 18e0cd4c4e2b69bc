using System.Text.Json;

namespace OpsLvp.FaultCases;

/// <summary>
/// Sends generated <see cref="HostileBodies"/> to a running server's <c>POST /api/readings</c> from a few parallel
/// senders and judges each answer with <see cref="HostileAnswer"/>; every 1 000 bodies (and at the end) the server must
/// still be alive and answer <c>/health</c>. Rows of <see cref="Group"/> in the tally, one per case.
/// </summary>
public static class HostileRun
{
    public const string Group = "hostile ingest body";

    public static async Task RunAsync(HttpClient client, long count, int seed, int parallel, FaultTally tally, Func<string?> deathReason, Action<string> log, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(client);
        ArgumentNullException.ThrowIfNull(tally);
        ArgumentNullException.ThrowIfNull(deathReason);
        ArgumentNullException.ThrowIfNull(log);
        long next = -1;
        var dead = false;
        var senders = Enumerable.Range(0, parallel).Select(_ => Task.Run(async () =>
        {
            long i;
            while (!dead && !cancellationToken.IsCancellationRequested && (i = Interlocked.Increment(ref next)) < count)
            {
                var body = HostileBodies.Make(seed, i, DateTimeOffset.UtcNow);
                var verdict = await SendAsync(client, body, i);
                if (verdict is null)
                {
                    tally.Held(Group, body.Case);
                }
                else
                {
                    tally.Broke(Group, body.Case, $"body {i} ({body.Preview()}): {verdict}");
                }
                if (i % 1000 == 999)
                {
                    if (await AliveAsync(client, deathReason) is { } why)
                    {
                        tally.Broke(Group, "server alive every 1 000 bodies", $"after body {i}: {why}");
                        dead = true;
                    }
                    else
                    {
                        tally.Held(Group, "server alive every 1 000 bodies");
                    }
                }
                if (i % 50_000 == 49_999)
                {
                    log($"hostile bodies {i + 1:N0}/{count:N0}: {tally.BrokeIn(Group)} broke");
                }
            }
        }, CancellationToken.None)).ToArray();
        await Task.WhenAll(senders);
        if (!dead)
        {
            if (await AliveAsync(client, deathReason) is { } why)
            {
                tally.Broke(Group, "server alive every 1 000 bodies", $"at the end: {why}");
            }
            else
            {
                tally.Held(Group, "server alive every 1 000 bodies");
            }
        }
    }

    /// <summary>Null when the answer to <paramref name="body"/> is correct, else why not.</summary>
    public static async Task<string?> SendAsync(HttpClient client, HostileBody body, long index)
    {
        ArgumentNullException.ThrowIfNull(client);
        ArgumentNullException.ThrowIfNull(body);
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative));
        HttpContent content = body.Chunked ? new StreamContent(new OneWayStream(body.Body)) : new ByteArrayContent(body.Body);
        if (body.ContentType is not null)
        {
            content.Headers.TryAddWithoutValidation("Content-Type", body.ContentType);
        }
        else
        {
            content.Headers.ContentType = null;
        }
        request.Content = content;
        if (body.Body.Length > HostileBodies.MaxBodyBytes)
        {
            // a well-behaved client with a large body asks first, so a 413 reaches it before it has sent the body
            // (without it the server's 413 and close can race the client still sending, and the answer is lost)
            request.Headers.ExpectContinue = true;
        }
        if (body.WithKey)
        {
            request.Headers.Add("X-Api-Key", FaultProfile.PushKey);
        }
        else if (index % 2 == 1)
        {
            request.Headers.Add("X-Api-Key", "not-a-key-" + index);
        }
        try
        {
            using var response = await client.SendAsync(request);
            var text = await response.Content.ReadAsStringAsync();
            return HostileAnswer.Check(body, (int)response.StatusCode, text);
        }
        catch (HttpRequestException ex)
        {
            return $"no answer: {ex.Message}";
        }
        catch (TaskCanceledException ex)
        {
            return $"no answer within the client timeout: {ex.Message}";
        }
    }

    private static async Task<string?> AliveAsync(HttpClient client, Func<string?> deathReason)
    {
        if (deathReason() is { } died)
        {
            return died;
        }
        try
        {
            using var health = await client.GetAsync(new Uri("/health", UriKind.Relative));
            if (!health.IsSuccessStatusCode)
            {
                return $"/health answered {(int)health.StatusCode}";
            }
            using var document = JsonDocument.Parse(await health.Content.ReadAsStringAsync());
            var status = document.RootElement.GetProperty("status").GetString();
            return status == "ok" ? null : $"/health status {status}";
        }
        catch (HttpRequestException ex)
        {
            return $"/health did not answer: {ex.Message}";
        }
    }

    /// <summary>A stream that cannot seek, so the client sends it chunked, without a length.</summary>
    private sealed class OneWayStream(byte[] bytes) : MemoryStream(bytes, writable: false)
    {
        public override bool CanSeek => false;
    }
}
