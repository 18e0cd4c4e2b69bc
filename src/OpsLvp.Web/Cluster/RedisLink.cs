using Microsoft.Extensions.Options;
using StackExchange.Redis;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// This node's one Redis connection for snapshot fan-out and command forwarding (the SignalR backplane keeps its own).
/// Opened at start without failing the start: an unreachable Redis is logged as an error naming <c>Cluster:Redis</c>,
/// StackExchange.Redis keeps reconnecting, and until then standbys say NOT LIVE and forwarded commands are not applied
/// (docs/deployment.md "Fan-out and commands between nodes").
/// </summary>
public sealed class RedisLink(IOptions<FanoutOptions> options, ILogger<RedisLink> logger) : IHostedService, IAsyncDisposable
{
    private readonly FanoutOptions _options = options.Value;
    private readonly TaskCompletionSource<IConnectionMultiplexer> _connected = new(TaskCreationOptions.RunContinuationsAsynchronously);
    private ConnectionMultiplexer? _multiplexer;

    /// <summary>The connection once <see cref="StartAsync"/> has opened it (it may still be reconnecting).</summary>
    public Task<IConnectionMultiplexer> Connection => _connected.Task;

    /// <summary>True while the connection to Redis is up.</summary>
    public bool IsConnected => _multiplexer?.IsConnected ?? false;

    /// <summary>A channel name under <see cref="FanoutOptions.RedisPrefix"/>.</summary>
    public RedisChannel Channel(string name) => RedisChannel.Literal($"{_options.RedisPrefix}:{name}");

    /// <summary>A key name under <see cref="FanoutOptions.RedisPrefix"/>.</summary>
    public RedisKey Key(string name) => new($"{_options.RedisPrefix}:{name}");

    /// <summary>The configuration used: the setting's with AbortOnConnectFail off, so a Redis down at start does not stop the node.</summary>
    public static ConfigurationOptions Configure(string configuration)
    {
        var parsed = ConfigurationOptions.Parse(configuration);
        parsed.AbortOnConnectFail = false;
        return parsed;
    }

    /// <summary>Whether <c>Cluster:Redis</c> is set; without it nothing here connects and <see cref="Connection"/> never completes.</summary>
    public bool Enabled => _options.Enabled;

    /// <summary>Starts connecting without holding up the start: a node whose Redis is down still serves its pages.</summary>
    public Task StartAsync(CancellationToken cancellationToken)
    {
        if (_options.Enabled)
        {
            _ = Task.Run(ConnectAsync, CancellationToken.None);
        }
        return Task.CompletedTask;
    }

    private async Task ConnectAsync()
    {
        ConnectionMultiplexer multiplexer;
        try
        {
            multiplexer = await ConnectionMultiplexer.ConnectAsync(Configure(_options.Redis));
        }
        catch (Exception ex) when (ex is RedisException or TimeoutException)
        {
            logger.LogError(ex, "Cluster:Redis ({Configuration}) could not be opened: this node cannot fan out states or forward commands", _options.Redis);
            _connected.TrySetException(ex);
            return;
        }
        multiplexer.ConnectionFailed += (_, e) => logger.LogError(e.Exception,
            "Cluster:Redis ({Endpoint}) not reachable ({Failure}): this node cannot fan out states or forward commands until it is back",
            e.EndPoint, e.FailureType);
        multiplexer.ConnectionRestored += (_, e) => logger.LogWarning("Cluster:Redis ({Endpoint}) reachable again", e.EndPoint);
        if (!multiplexer.IsConnected)
        {
            logger.LogError(
                "Cluster:Redis ({Configuration}) not reachable at start: this node runs, but cannot fan out states or forward commands until it is; retrying",
                _options.Redis);
        }
        _multiplexer = multiplexer;
        _connected.TrySetResult(multiplexer);
    }

    public Task StopAsync(CancellationToken cancellationToken)
    {
        _connected.TrySetCanceled(CancellationToken.None);
        return Task.CompletedTask;
    }

    public async ValueTask DisposeAsync()
    {
        if (_multiplexer is { } multiplexer)
        {
            await multiplexer.CloseAsync(allowCommandsToComplete: false);
            multiplexer.Dispose();
        }
    }
}
