using System.Diagnostics;
using System.Text.Json;
using Microsoft.AspNetCore.SignalR.Client;
using OpsLvp.Web.Access;

namespace OpsLvp.Benchmarks.Live;

/// <summary>One SignalR client that records when the first <c>state</c> after <see cref="Arm"/> carrying the marker arrives.</summary>
internal sealed class HubProbe : IAsyncDisposable
{
    private readonly HubConnection _connection;
    private TaskCompletionSource<long> _received = NewSource();
    private volatile string? _marker;
    private long _awaitedVersion = -2;
    private long _deliveries;

    public HubProbe(Uri hub, string? key)
    {
        _connection = new HubConnectionBuilder().WithUrl(hub, o =>
        {
            if (key is not null)
            {
                o.Headers[ApiKeyAuthenticationHandler.Header] = key;
            }
        }).Build();
        _connection.On<JsonElement>("state", payload =>
        {
            var now = Stopwatch.GetTimestamp();
            var text = payload.GetRawText();
            LastPayloadChars = text.Length;
            var version = payload.ValueKind == JsonValueKind.Object && payload.TryGetProperty("version", out var v) && v.TryGetInt64(out var number) ? number : -1;
            if (_marker is not { } marker || text.Contains(marker, StringComparison.Ordinal))
            {
                if (Volatile.Read(ref _received).TrySetResult(now))
                {
                    Interlocked.Exchange(ref _awaitedVersion, version);
                }
            }
            if (version >= 0 && version == Interlocked.Read(ref _awaitedVersion))
            {
                Interlocked.Increment(ref _deliveries);
            }
        });
    }

    public int LastPayloadChars { get; private set; }

    public Task<long> Received => Volatile.Read(ref _received).Task;

    public Task StartAsync() => _connection.StartAsync();

    /// <summary>How many <c>state</c> messages of the awaited snapshot's version arrived since <see cref="Arm"/>.</summary>
    public long Deliveries => Interlocked.Read(ref _deliveries);

    public void Arm(string? marker)
    {
        _marker = marker;
        Interlocked.Exchange(ref _awaitedVersion, -2);
        Interlocked.Exchange(ref _deliveries, 0);
        Volatile.Write(ref _received, NewSource());
    }

    public ValueTask DisposeAsync() => _connection.DisposeAsync();

    private static TaskCompletionSource<long> NewSource() => new(TaskCreationOptions.RunContinuationsAsynchronously);
}
