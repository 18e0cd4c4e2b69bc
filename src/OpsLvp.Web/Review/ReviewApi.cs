using System.Text;
using OpsLvp.Core.Review;
using OpsLvp.Web.Access;

namespace OpsLvp.Web.Review;

/// <summary>
/// Review endpoints in one group under <c>/api/episodes</c> (so an authorisation policy is attached in one place):
/// <c>GET /api/episodes</c> (list), <c>/{id}/readings.csv</c>, <c>/{id}/audit.csv</c>, <c>/{id}/capability.csv</c>, <c>/{id}/export.json</c>
/// (docs/review.md). An unknown episode is 404 with a JSON error naming it.
/// </summary>
public static class ReviewApi
{
    public const string Prefix = "/api/episodes";

    public static RouteGroupBuilder MapReviewApi(this IEndpointRouteBuilder app)
    {
        ArgumentNullException.ThrowIfNull(app);
        var group = app.MapGroup(Prefix).WithNoStore();
        group.MapGet("/", async (ReviewService review, CancellationToken ct) =>
        {
            var (episodes, record) = await review.ListAsync(ct);
            return Results.Json(new
            {
                chain_verifies = record.Chain.Ok,
                episodes = episodes.Select(e => new
                {
                    id = e.Id,
                    start = ReviewCsv.Time(e.Start),
                    end = e.End is { } end ? ReviewCsv.Time(end) : null,
                    deepest_phase = e.DeepestPhase.ToString().ToLowerInvariant(),
                    lowest_rvr_m = e.LowestRvrM,
                    lowest_ceiling_ft = e.LowestCeilingFt,
                    alarms = e.Alarms,
                }),
            });
        });
        group.MapGet("/{id}/readings.csv", (string id, ReviewService review, CancellationToken ct) =>
            WithEpisode(id, review, ct, v => Results.File(Encoding.UTF8.GetBytes(ReviewCsv.Readings(v.Export.Readings)), "text/csv; charset=utf-8", $"{id}-readings.csv")));
        group.MapGet("/{id}/audit.csv", (string id, ReviewService review, CancellationToken ct) =>
            WithEpisode(id, review, ct, v => Results.File(Encoding.UTF8.GetBytes(ReviewCsv.Audit(v.Export.Audit)), "text/csv; charset=utf-8", $"{id}-audit.csv")));
        group.MapGet("/{id}/capability.csv", (string id, ReviewService review, CancellationToken ct) =>
            WithEpisode(id, review, ct, v => Results.File(Encoding.UTF8.GetBytes(CapabilityExport.Csv(v.Export)), "text/csv; charset=utf-8", $"{id}-capability.csv")));
        group.MapGet("/{id}/export.json", (string id, ReviewService review, CancellationToken ct) =>
            WithEpisode(id, review, ct, v => Results.File(Encoding.UTF8.GetBytes(v.Export.ToJson()), "application/json", $"{id}.episode.json")));
        return group;
    }

    private static async Task<IResult> WithEpisode(string id, ReviewService review, CancellationToken ct, Func<EpisodeView, IResult> result)
    {
        var view = await review.GetAsync(id, ct);
        return view is null
            ? Results.Json(new { error = $"no episode '{id}' (or no profile loaded)" }, statusCode: StatusCodes.Status404NotFound)
            : result(view);
    }
}
