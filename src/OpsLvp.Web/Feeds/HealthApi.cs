using Microsoft.AspNetCore.Http.HttpResults;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// <c>GET /health</c>: liveness, per-feed health and the engine host's health (docs/feeds.md, "Health"). Always 200 while
/// the server runs; <c>status</c> is <c>failing</c> while it is not recording (storage failing, docs/reliability.md "Storage faults").
/// </summary>
public static class HealthApi
{
    public static IEndpointRouteBuilder MapHealthApi(this IEndpointRouteBuilder endpoints)
    {
        endpoints.MapGet("/health", GetHealth);
        return endpoints;
    }

    private static Ok<HealthResponse> GetHealth(FeedHealthRegistry registry, DemoMode demo, TimeProvider clock, LiveEngineHost engine)
    {
        var feeds = registry.Snapshot();
        var worst = feeds.Count == 0 ? FeedStatus.Ok : feeds.Max(f => f.Status);
        var engineHealth = engine.Health;
        return TypedResults.Ok(new HealthResponse(
            engineHealth.NotRecordingSince is null && engineHealth.Stopped is null ? "ok" : "failing",
            clock.GetUtcNow(),
            demo.Enabled,
            demo.Enabled ? demo.Speed : null,
            FeedHealthDto.StatusText(worst),
            feeds.Select(FeedHealthDto.From).ToList(),
            engineHealth));
    }
}
