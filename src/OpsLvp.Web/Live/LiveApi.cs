using Microsoft.AspNetCore.Http.HttpResults;
using OpsLvp.Web.Access;
using OpsLvp.Web.Cluster;

namespace OpsLvp.Web.Live;

/// <summary><c>GET /api/state</c> and the hub <c>/hubs/lvp</c>.</summary>
public static class LiveApi
{
    /// <summary>The one place that decides who may read live state (hub and API); null = open. The access work sets it.</summary>
    public static string? HubPolicy { get; set; }

    public const string HubPath = "/hubs/lvp";

    public static IEndpointRouteBuilder MapLiveApi(this IEndpointRouteBuilder endpoints)
    {
        var hub = endpoints.MapHub<LvpHub>(HubPath);
        var state = endpoints.MapGet("/api/state", GetState).WithNoStore();
        if (HubPolicy is { } policy)
        {
            hub.RequireAuthorization(policy);
            state.RequireAuthorization(policy);
        }
        return endpoints;
    }

    private static Results<JsonHttpResult<LiveSnapshot>, ProblemHttpResult> GetState(ILiveState live, ILeadership leadership) =>
        live.Current is { } snapshot
            ? TypedResults.Json(snapshot, LiveJson.Options)
            : TypedResults.Problem(
                leadership.IsLeader
                    ? "the engine has not published a state yet"
                    : "this node is a standby and has received no state from the leading node yet (docs/deployment.md \"Fan-out and commands between nodes\")",
                statusCode: StatusCodes.Status503ServiceUnavailable);
}
