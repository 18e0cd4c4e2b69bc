using Microsoft.AspNetCore.SignalR;
using Microsoft.AspNetCore.SignalR.Protocol;
using Microsoft.AspNetCore.SignalR.StackExchangeRedis;
using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// The hub's lifetime manager chosen when the app is built, since <c>Cluster:Redis</c> is known only then: the
/// <c>Microsoft.AspNetCore.SignalR.StackExchangeRedis</c> backplane with the setting, SignalR's default otherwise.
/// Every call goes to the one chosen, except <see cref="SendAllLocalAsync"/>, which reaches this node's own clients only.
/// </summary>
public sealed class ClusterHubLifetimeManager<THub> : HubLifetimeManager<THub>, IDisposable
    where THub : Hub
{
    private readonly HubLifetimeManager<THub> _inner;
    private readonly HubConnectionStore _local = new();

    public ClusterHubLifetimeManager(IServiceProvider services, IOptions<FanoutOptions> fanout)
    {
        ArgumentNullException.ThrowIfNull(services);
        ArgumentNullException.ThrowIfNull(fanout);
        _inner = fanout.Value.Enabled
            ? new RedisHubLifetimeManager<THub>(
                services.GetRequiredService<ILogger<RedisHubLifetimeManager<THub>>>(),
                services.GetRequiredService<IOptions<RedisOptions>>(),
                services.GetRequiredService<IHubProtocolResolver>(),
                services.GetRequiredService<IOptions<HubOptions>>(),
                services.GetRequiredService<IOptions<HubOptions<THub>>>())
            : new DefaultHubLifetimeManager<THub>(services.GetRequiredService<ILogger<DefaultHubLifetimeManager<THub>>>());
    }

    public override Task OnConnectedAsync(HubConnectionContext connection)
    {
        ArgumentNullException.ThrowIfNull(connection);
        _local.Add(connection);
        return _inner.OnConnectedAsync(connection);
    }

    public override Task OnDisconnectedAsync(HubConnectionContext connection)
    {
        ArgumentNullException.ThrowIfNull(connection);
        _local.Remove(connection);
        return _inner.OnDisconnectedAsync(connection);
    }

    /// <summary>
    /// Sends to the hub clients connected to THIS node, never through the backplane. Every node shows the leader's
    /// snapshots itself (<see cref="SnapshotFanout"/>), so each node sends each one to its own clients: sent through the
    /// backplane by every node, each client would get every state once per node (docs/deployment.md "Fan-out").
    /// </summary>
    public Task SendAllLocalAsync(string methodName, object?[] args, CancellationToken cancellationToken = default)
    {
        var message = new SerializedHubMessage(new InvocationMessage(methodName, args));
        var writes = new List<Task>();
        foreach (var connection in _local)
        {
            var write = connection.WriteAsync(message, cancellationToken);
            if (!write.IsCompletedSuccessfully)
            {
                writes.Add(write.AsTask());
            }
        }
        return Task.WhenAll(writes);
    }

    public override Task SendAllAsync(string methodName, object?[] args, CancellationToken cancellationToken = default) =>
        _inner.SendAllAsync(methodName, args, cancellationToken);

    public override Task SendAllExceptAsync(string methodName, object?[] args, IReadOnlyList<string> excludedConnectionIds, CancellationToken cancellationToken = default) =>
        _inner.SendAllExceptAsync(methodName, args, excludedConnectionIds, cancellationToken);

    public override Task SendConnectionAsync(string connectionId, string methodName, object?[] args, CancellationToken cancellationToken = default) =>
        _inner.SendConnectionAsync(connectionId, methodName, args, cancellationToken);

    public override Task SendConnectionsAsync(IReadOnlyList<string> connectionIds, string methodName, object?[] args, CancellationToken cancellationToken = default) =>
        _inner.SendConnectionsAsync(connectionIds, methodName, args, cancellationToken);

    public override Task SendGroupAsync(string groupName, string methodName, object?[] args, CancellationToken cancellationToken = default) =>
        _inner.SendGroupAsync(groupName, methodName, args, cancellationToken);

    public override Task SendGroupsAsync(IReadOnlyList<string> groupNames, string methodName, object?[] args, CancellationToken cancellationToken = default) =>
        _inner.SendGroupsAsync(groupNames, methodName, args, cancellationToken);

    public override Task SendGroupExceptAsync(string groupName, string methodName, object?[] args, IReadOnlyList<string> excludedConnectionIds, CancellationToken cancellationToken = default) =>
        _inner.SendGroupExceptAsync(groupName, methodName, args, excludedConnectionIds, cancellationToken);

    public override Task SendUserAsync(string userId, string methodName, object?[] args, CancellationToken cancellationToken = default) =>
        _inner.SendUserAsync(userId, methodName, args, cancellationToken);

    public override Task SendUsersAsync(IReadOnlyList<string> userIds, string methodName, object?[] args, CancellationToken cancellationToken = default) =>
        _inner.SendUsersAsync(userIds, methodName, args, cancellationToken);

    public override Task AddToGroupAsync(string connectionId, string groupName, CancellationToken cancellationToken = default) =>
        _inner.AddToGroupAsync(connectionId, groupName, cancellationToken);

    public override Task RemoveFromGroupAsync(string connectionId, string groupName, CancellationToken cancellationToken = default) =>
        _inner.RemoveFromGroupAsync(connectionId, groupName, cancellationToken);

    public override Task<T> InvokeConnectionAsync<T>(string connectionId, string methodName, object?[] args, CancellationToken cancellationToken) =>
        _inner.InvokeConnectionAsync<T>(connectionId, methodName, args, cancellationToken);

    public override Task SetConnectionResultAsync(string connectionId, CompletionMessage result) =>
        _inner.SetConnectionResultAsync(connectionId, result);

    public override bool TryGetReturnType(string invocationId, [System.Diagnostics.CodeAnalysis.NotNullWhen(true)] out Type? type) =>
        _inner.TryGetReturnType(invocationId, out type);

    public void Dispose() => (_inner as IDisposable)?.Dispose();
}
