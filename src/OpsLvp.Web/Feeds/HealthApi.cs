using System.Data.Common;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Live;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// <c>GET /health</c>: liveness, per-feed health, the engine host's health and which node answers (docs/feeds.md,
/// "Health"; docs/deployment.md "Which node am I: /health"). Always 200 while the server runs, so
/// <c>--healthcheck</c> (a container's liveness) restarts only a node that does not answer; <c>status</c> is
/// <c>failing</c> while it is not recording (storage failing, docs/reliability.md "Storage faults") or, on a standby,
/// while it hears no leader state (NOT LIVE). <c>GET /health/ready</c> is the same body, answered 503 while
/// <c>status</c> is <c>failing</c>, for a load balancer that takes a node that cannot show live state out of rotation.
/// </summary>
public static class HealthApi
{
    public static IEndpointRouteBuilder MapHealthApi(this IEndpointRouteBuilder endpoints)
    {
        // cast to Delegate: a handler of HttpContext returning a Task of a result would bind as a RequestDelegate and drop the result
        endpoints.MapGet("/health", (Delegate)GetAsync);
        endpoints.MapGet("/health/ready", (Delegate)GetReadyAsync);
        return endpoints;
    }

    private static async Task<Ok<HealthResponse>> GetAsync(HttpContext context) =>
        TypedResults.Ok(await BuildAsync(context.RequestServices, context.RequestAborted));

    private static async Task<Results<Ok<HealthResponse>, JsonHttpResult<HealthResponse>>> GetReadyAsync(HttpContext context)
    {
        var health = await BuildAsync(context.RequestServices, context.RequestAborted);
        return health.Status == "ok"
            ? TypedResults.Ok(health)
            : TypedResults.Json(health, statusCode: StatusCodes.Status503ServiceUnavailable);
    }

    private static async Task<HealthResponse> BuildAsync(IServiceProvider services, CancellationToken cancellationToken)
    {
        var registry = services.GetRequiredService<FeedHealthRegistry>();
        var demo = services.GetRequiredService<DemoMode>();
        var clock = services.GetRequiredService<TimeProvider>();
        var engine = services.GetRequiredService<LiveEngineHost>();
        var feeds = registry.Snapshot();
        var worst = feeds.Count == 0 ? FeedStatus.Ok : feeds.Max(f => f.Status);
        var engineHealth = engine.Health;
        var node = await WithInboxAsync(Node(services), services, cancellationToken);
        var reason = engineHealth.Stopped is { } stopped ? $"the engine is stopped: {stopped}"
            : engineHealth.NotRecordingSince is not null ? $"not recording: {engineHealth.AuditError ?? "storage failing"}"
            : !node.Live ? NotLiveReason(node, services)
            : null;
        return new HealthResponse(
            reason is null ? "ok" : "failing",
            clock.GetUtcNow(),
            demo.Enabled,
            demo.Enabled ? demo.Speed : null,
            FeedHealthDto.StatusText(worst),
            feeds.Select(FeedHealthDto.From).ToList(),
            engineHealth,
            node,
            reason);
    }

    private static NodeHealth Node(IServiceProvider services)
    {
        var leadership = services.GetRequiredService<ILeadership>();
        var fanoutOptions = services.GetService<IOptions<FanoutOptions>>()?.Value;
        var redis = services.GetService<RedisLink>();
        var fanout = services.GetService<SnapshotFanout>();
        var forwarding = services.GetService<CommandForwarding>();
        var configured = fanoutOptions?.Enabled == true && redis is not null;
        var single = leadership is not ILeadershipElection && !configured;
        var role = single ? "single" : leadership.IsLeader ? "leader" : "standby";
        var lastHeard = role == "standby" ? fanout?.LastReceivedAt : null;
        long? epoch = role switch
        {
            "leader" => leadership.Epoch,
            "standby" when lastHeard is not null => services.GetRequiredService<LiveState>().CurrentEpoch,
            _ => null,
        };
        return new NodeHealth(
            leadership.NodeId,
            role,
            epoch,
            !configured ? "not configured" : redis!.IsConnected ? "connected" : "unreachable",
            lastHeard,
            role != "standby" || (fanout?.HearsLeader ?? false),
            forwarding?.Refusals ?? 0,
            forwarding?.LastRefusal);
    }

    /// <summary>
    /// With several nodes, how many pushed batches wait in the reading inbox and since when (a backlog that does not go
    /// down means no leader takes them). Asked with a short timeout: a database that does not answer leaves the figure
    /// unknown (null), and <c>/health</c> still answers.
    /// </summary>
    private static async Task<NodeHealth> WithInboxAsync(NodeHealth node, IServiceProvider services, CancellationToken cancellationToken)
    {
        if (node.Role == "single" || services.GetService<ReadingInboxStore>() is not { } inbox)
        {
            return node;
        }
        node = node with
        {
            InboxMaxBatches = services.GetService<IOptions<ClusterOptions>>()?.Value.InboxMaxBatches,
            InboxRefused = services.GetService<InboxLimit>()?.Refused ?? 0,
            InboxSetAside = services.GetService<InboxAlarms>()?.SetAsideCount ?? 0,
        };
        using var timeout = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        timeout.CancelAfter(s_inboxQueryTimeout);
        try
        {
            var (batches, oldest) = await inbox.WaitingAsync(timeout.Token);
            return node with { InboxWaiting = batches, InboxOldestReceivedAt = oldest };
        }
        catch (Exception ex) when (ex is OperationCanceledException or DbException or InvalidOperationException)
        {
            return node;
        }
    }

    private static readonly TimeSpan s_inboxQueryTimeout = TimeSpan.FromSeconds(2);

    private static string NotLiveReason(NodeHealth node, IServiceProvider services)
    {
        var silence = services.GetService<IOptions<FanoutOptions>>()?.Value.LeaderSilence ?? TimeSpan.Zero;
        var why = node.LastLeaderStateAt is null
            ? "this standby has received no state from a leader yet"
            : $"this standby has received no state from the leader for more than {silence.TotalSeconds:0.#} s";
        var reason = node.Fanout == "unreachable"
            ? $"NOT LIVE: {why} (Cluster:Redis not reachable)"
            : $"NOT LIVE: {why}";
        // what waits for the next leader, so the room knows readings are kept, not lost (docs/engine.md R80)
        return node.InboxWaiting is int waiting and > 0
            ? $"{reason}; {waiting} reading batch(es) queued for the leader{(waiting >= node.InboxMaxBatches ? " (the inbox is full: further pushes are refused with 503)" : "")}"
            : reason;
    }
}
