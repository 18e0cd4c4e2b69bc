using System.Text.Json;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Forecast;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Forecast push ingest: <c>POST /api/forecasts</c> with <c>{"forecasts":[{"type":"taf"|"metar","text":"…"}]}</c> and
/// an <c>X-Api-Key</c> header with the ingest scope, like <c>POST /api/readings</c> (docs/feeds.md "Forecast push").
/// A <c>taf</c> item is a TAF; a <c>metar</c> item is a METAR/SPECI whose TREND is the forecast (its observed values
/// come through the METAR feed or the readings push, not here). Each item is decoded before it is queued: one that does
/// not decode (or a METAR without TREND) is rejected with the decoder's reason and logged; the others still count.
/// 202 means the accepted ones are recorded; 503 with <c>Retry-After</c> while the server is not recording.
/// </summary>
public static class ForecastsApi
{
    public static IEndpointRouteBuilder MapForecastsApi(this IEndpointRouteBuilder endpoints)
    {
        endpoints.MapPost("/api/forecasts", PostForecastsAsync).DisableAntiforgery();
        return endpoints;
    }

    /// <summary>The forecast inputs and per-item results of a document (public for tests); throws <see cref="FeedFormatException"/> for a bad document.</summary>
    public static (List<ForecastInput> Forecasts, List<PushItemResult> Items) Parse(byte[] body, DateTimeOffset now, int maxItems)
    {
        ArgumentNullException.ThrowIfNull(body);
        JsonDocument doc;
        try
        {
            doc = JsonDocument.Parse(body);
        }
        catch (JsonException ex)
        {
            throw new FeedFormatException("body is not JSON: " + ex.Message);
        }
        using (doc)
        {
            if (doc.RootElement.ValueKind != JsonValueKind.Object || !doc.RootElement.TryGetProperty("forecasts", out var list) || list.ValueKind != JsonValueKind.Array)
            {
                throw new FeedFormatException("expected an object with a \"forecasts\" array");
            }
            if (list.GetArrayLength() > maxItems)
            {
                throw new FeedItemLimitException($"\"forecasts\" has {list.GetArrayLength()} items; at most {maxItems} are accepted per document");
            }
            var forecasts = new List<ForecastInput>();
            var items = new List<PushItemResult>();
            var index = 0;
            foreach (var item in list.EnumerateArray())
            {
                var type = item.ValueKind == JsonValueKind.Object && item.TryGetProperty("type", out var t) && t.ValueKind == JsonValueKind.String ? t.GetString() : null;
                var text = item.ValueKind == JsonValueKind.Object && item.TryGetProperty("text", out var x) && x.ValueKind == JsonValueKind.String ? x.GetString() : null;
                string? error;
                if (string.IsNullOrWhiteSpace(text))
                {
                    error = "\"text\" is missing or empty";
                }
                else if (type is not ("taf" or "metar"))
                {
                    error = $"\"type\" must be \"taf\" or \"metar\", not {(type is null ? "missing" : $"\"{type}\"")}";
                }
                else
                {
                    var input = new ForecastInput(type == "taf" ? ForecastOrigin.Taf : ForecastOrigin.Trend, text.Trim(), now);
                    error = LvpEngine.TryPlace(input, out _, out var why) ? null : why;
                    if (error is null)
                    {
                        forecasts.Add(input);
                    }
                }
                items.Add(error is null
                    ? new PushItemResult(index, null, PushItemResult.Accepted)
                    : new PushItemResult(index, null, PushItemResult.Rejected, "malformed", error));
                index++;
            }
            return (forecasts, items);
        }
    }

    private static async Task<Results<Accepted<PushResponse>, JsonHttpResult<ApiError>>> PostForecastsAsync(
        HttpContext context,
        IOptions<FeedsOptions> options,
        ReadingPipeline pipeline,
        FeedHealthRegistry health,
        ApiKeyStore keys,
        LiveEngineHost engine,
        TimeProvider clock,
        ILoggerFactory loggers)
    {
        var push = options.Value.Push;
        var logger = loggers.CreateLogger(typeof(ForecastsApi).FullName!);
        var caller = await IngestKeyCheck.CheckAsync(context, push, keys, "push ingest");
        if (caller.Refusal is { } refusal)
        {
            return refusal;
        }
        var source = "push:" + caller.KeyName;
        if (context.Request.ContentLength > push.MaxBodyBytes)
        {
            return Error(StatusCodes.Status413PayloadTooLarge, $"request body exceeds Feeds:Push:MaxBodyBytes ({push.MaxBodyBytes} bytes)");
        }
        using var buffer = new MemoryStream();
        await context.Request.Body.CopyToAsync(buffer, context.RequestAborted);
        if (buffer.Length > push.MaxBodyBytes)
        {
            return Error(StatusCodes.Status413PayloadTooLarge, $"request body exceeds Feeds:Push:MaxBodyBytes ({push.MaxBodyBytes} bytes)");
        }
        var now = clock.GetUtcNow();
        List<ForecastInput> forecasts;
        List<PushItemResult> items;
        try
        {
            (forecasts, items) = Parse(buffer.ToArray(), now, push.MaxReadings);
        }
        catch (FeedItemLimitException ex)
        {
            health.RecordFailure(source, "bad document: " + ex.Message);
            return Error(StatusCodes.Status413PayloadTooLarge, $"{ex.Message} (Feeds:Push:MaxReadings)");
        }
        catch (FeedFormatException ex)
        {
            health.RecordFailure(source, "bad document: " + ex.Message);
            logger.LogWarning("Forecast push from {Source} refused: {Reason}", source, ex.Message);
            return Error(StatusCodes.Status400BadRequest, ex.Message);
        }
        var rejected = items.Where(i => i.Outcome == PushItemResult.Rejected).Select(i => new PushRejection(i.Index, i.Reason!, i.Detail!, null)).ToList();
        foreach (var r in rejected)
        {
            logger.LogWarning("Forecast push from {Source}: item {Index} rejected: {Detail}", source, r.Index, r.Detail);
        }
        if (engine.Health.Stopped is { } stopped)
        {
            context.Response.Headers.RetryAfter = "60";
            return Error(StatusCodes.Status503ServiceUnavailable, $"not stored: the engine is stopped: {stopped}");
        }
        if (forecasts.Count > 0)
        {
            var receipt = engine.Health.Running ? new BatchReceipt() : null;
            var batch = new ReadingBatch(source, now, [], [], receipt) { Forecasts = forecasts };
            if (!pipeline.TrySubmit(batch))
            {
                logger.LogWarning("Forecast push from {Source} refused: reading pipeline full", source);
                context.Response.Headers.RetryAfter = "5";
                return Error(StatusCodes.Status503ServiceUnavailable, "reading pipeline is full; retry later");
            }
            if (receipt is not null)
            {
                BatchOutcome outcome;
                try
                {
                    outcome = await receipt.Outcome.WaitAsync(ReadingsApi.StoreWait, context.RequestAborted);
                }
                catch (TimeoutException)
                {
                    outcome = new BatchOutcome(false, $"not confirmed stored within {ReadingsApi.StoreWait.TotalSeconds:0} s");
                }
                if (!outcome.Stored)
                {
                    context.Response.Headers.RetryAfter = "5";
                    return Error(StatusCodes.Status503ServiceUnavailable, $"not stored, retry later: {outcome.Reason}");
                }
            }
        }
        health.RecordSuccess(source, forecasts.Count, rejected.Count);
        return TypedResults.Accepted((string?)null, new PushResponse(source, forecasts.Count, rejected, items));
    }

    private static JsonHttpResult<ApiError> Error(int status, string error) => TypedResults.Json(new ApiError(error), statusCode: status);
}
