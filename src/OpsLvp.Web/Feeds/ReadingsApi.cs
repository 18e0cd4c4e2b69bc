using System.Text;
using Microsoft.AspNetCore.Http.Features;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Authentication;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Data.Entities;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Access;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Push ingest: <c>POST /api/readings</c> with the readings JSON and an <c>X-Api-Key</c> header (docs/feeds.md): a key
/// with the ingest scope issued on /admin/keys, or a bootstrap key from <c>Feeds:Push:ApiKeys</c> (docs/access.md).
/// 202 means the readings are durably stored (docs/reliability.md "Storage faults"); while the server is not recording the answer is
/// 503 with the reason and <c>Retry-After</c>, so the feed keeps them and sends them again. On a standby node the batch is
/// screened the same way and handed to the leader through the reading inbox (docs/engine.md R73).
/// </summary>
public static class ReadingsApi
{
    public const string ApiKeyHeader = "X-Api-Key";

    /// <summary>How long a push waits for its batch to be stored before the answer is 503 (the feed retries; a duplicate is refused then).</summary>
    public static readonly TimeSpan StoreWait = TimeSpan.FromSeconds(30);

    /// <summary>The <c>Retry-After</c> of a push refused because the reading inbox is full (docs/engine.md R80).</summary>
    public const int InboxFullRetryAfterSeconds = 10;

    /// <summary>How many times <c>Feeds:Push:MaxBodyBytes</c> an over-long body without a length is read and dropped before the 413.</summary>
    public const int DrainFactor = 4;

    public static IEndpointRouteBuilder MapReadingsApi(this IEndpointRouteBuilder endpoints)
    {
        endpoints.MapPost("/api/readings", PostReadingsAsync).DisableAntiforgery();
        return endpoints;
    }

    private static async Task<Results<Accepted<PushResponse>, JsonHttpResult<ApiError>>> PostReadingsAsync(
        HttpContext context,
        IOptions<FeedsOptions> options,
        ReadingPipeline pipeline,
        FeedHealthRegistry health,
        ApiKeyStore keys,
        LiveEngineHost engine,
        ReadingInboxStore inbox,
        ILeadership leadership,
        IOptions<ClusterOptions> cluster,
        InboxLimit inboxLimit,
        TimeProvider clock,
        ILoggerFactory loggers)
    {
        var push = options.Value.Push;
        var auth = await context.AuthenticateAsync(AccessSchemes.ApiKey);
        if (!auth.Succeeded)
        {
            if (push.ApiKeys.Count == 0 && !await keys.AnyActiveAsync(ApiKeyStore.IngestScope, context.RequestAborted))
            {
                return Unauthorized(context, "push ingest is disabled: no keys are configured in Feeds:Push:ApiKeys or issued on /admin/keys");
            }

            return context.Request.Headers[ApiKeyHeader].ToString().Length == 0
                ? Unauthorized(context, $"missing {ApiKeyHeader} header")
                : Unauthorized(context, $"the {ApiKeyHeader} header does not match any configured key");
        }

        if (!auth.Principal.HasClaim(AccessClaims.Scope, ApiKeyStore.IngestScope))
        {
            return Error(StatusCodes.Status403Forbidden, "this API key does not have the ingest scope");
        }

        var keyName = (auth.Principal.Identity?.Name ?? "key:unknown")["key:".Length..];
        var source = "push:" + keyName;
        var body = await ReadBodyAsync(context, push.MaxBodyBytes);
        if (body is null)
        {
            return Error(StatusCodes.Status413PayloadTooLarge, $"request body exceeds Feeds:Push:MaxBodyBytes ({push.MaxBodyBytes} bytes)");
        }

        ReadingParseResult parsed;
        try
        {
            parsed = ReadingJsonParser.Parse(body, push.MaxReadings);
        }
        catch (FeedItemLimitException ex)
        {
            health.RecordFailure(source, "bad document: " + ex.Message);
            return Error(StatusCodes.Status413PayloadTooLarge, $"{ex.Message} (Feeds:Push:MaxReadings)");
        }
        catch (FeedFormatException ex)
        {
            health.RecordFailure(source, "bad document: " + ex.Message);
            return Error(StatusCodes.Status400BadRequest, ex.Message);
        }

        if (engine.Health.Stopped is { } stopped)
        {
            return RetryLater(context, $"not stored: the engine is stopped: {stopped}", retryAfterSeconds: 60);
        }
        if (engine.IsStandby)
        {
            return await HandOverAsync(context, body, parsed, source, inbox, leadership, engine, health, cluster.Value.InboxMaxBatches, inboxLimit, clock, loggers);
        }
        // With the engine host off (Engine:Enabled=false: no profile loaded) nothing stores readings: the batch is only
        // queued. Otherwise the answer always waits for the store, also while a node that has just won leadership is still
        // restoring (docs/engine.md R70): acknowledging then, before the store, lost readings when that node was killed.
        var receipt = engine.IsEnabled ? new BatchReceipt() : null;
        if (!pipeline.TrySubmit(parsed.ToBatch(source, clock.GetUtcNow()) with { Receipt = receipt }))
        {
            loggers.CreateLogger(typeof(ReadingsApi).FullName!).LogWarning("Push from {Source} refused: reading pipeline full", source);
            return RetryLater(context, "reading pipeline is full; retry later");
        }
        if (receipt is not null)
        {
            var outcome = await WaitStoredAsync(receipt, context.RequestAborted);
            if (!outcome.Stored)
            {
                loggers.CreateLogger(typeof(ReadingsApi).FullName!).LogWarning("Push from {Source} not stored: {Reason}", source, outcome.Reason);
                return RetryLater(context, $"not stored, retry later: {outcome.Reason}");
            }
        }

        var items = Screen(parsed, engine.Profile, clock.GetUtcNow());
        var answer = Answer(source, items);
        health.RecordSuccess(source, answer.Accepted, answer.Rejected.Count);
        return TypedResults.Accepted((string?)null, answer);
    }

    /// <summary>
    /// A standby (docs/engine.md R73): screens the batch exactly as the leader does, with the loaded profile, and stores
    /// the body as received in the reading inbox, durably and before the 202, with a <c>NOTIFY</c> that wakes the
    /// leader, which evaluates and records it as if pushed to it (R74). With no inbox (SQLite has one node, so this is
    /// only a test setting) or the database unreachable: 503 with the reason, nothing acknowledged.
    /// </summary>
    private static async Task<Results<Accepted<PushResponse>, JsonHttpResult<ApiError>>> HandOverAsync(
        HttpContext context, byte[] body, ReadingParseResult parsed, string source, ReadingInboxStore inbox, ILeadership leadership,
        LiveEngineHost engine, FeedHealthRegistry health, int maxBatches, InboxLimit inboxLimit, TimeProvider clock, ILoggerFactory loggers)
    {
        var logger = loggers.CreateLogger(typeof(ReadingsApi).FullName!);
        if (!inbox.IsAvailable)
        {
            // a standby without an inbox stores nothing itself (docs/engine.md R70): not acknowledged, the feed sends them again
            return RetryLater(context, $"not stored, retry later: {LiveEngineHost.StandbyText}");
        }
        var receivedAt = clock.GetUtcNow();
        var items = Screen(parsed, engine.Profile, receivedAt);
        var answer = Answer(source, items);
        if (parsed.Readings.Count > 0 || parsed.Rejections.Count > 0)
        {
            (long? Id, int Waiting) queued;
            try
            {
                queued = await inbox.TryEnqueueAsync(new ReadingInboxRow
                {
                    ReceivedAt = receivedAt,
                    Source = source,
                    NodeId = leadership.NodeId,
                    Body = Encoding.UTF8.GetString(body),
                    Accepted = answer.Accepted,
                    Rejected = answer.Rejected.Count,
                }, maxBatches, context.RequestAborted);
            }
            catch (Exception ex) when (ex is not OperationCanceledException || !context.RequestAborted.IsCancellationRequested)
            {
                var reason = $"the reading inbox could not be written: {EngineRecorder.Describe(ex)}";
                logger.LogWarning("Push from {Source} to standby {Node} not stored: {Reason}", source, leadership.NodeId, reason);
                return RetryLater(context, $"not stored, retry later: {reason}");
            }
            if (queued.Id is null)
            {
                // the inbox holds Cluster:InboxMaxBatches (docs/engine.md R80): nothing stored, nothing acknowledged; the
                // feed keeps the readings and sends them again once the leader has drained some
                var realClock = context.RequestServices.GetRequiredKeyedService<TimeProvider>(OpsLvp.Web.Time.TimeServiceCollectionExtensions.NetworkClockKey);
                inboxLimit.Refuse(source, leadership.NodeId, queued.Waiting, maxBatches, realClock.GetUtcNow(), logger);
                return RetryLater(context,
                    $"not stored, retry later: the reading inbox is full ({queued.Waiting} batch(es) wait for the leader, Cluster:InboxMaxBatches {maxBatches}); no node has taken them yet",
                    retryAfterSeconds: InboxFullRetryAfterSeconds);
            }
        }
        health.RecordSuccess(source, answer.Accepted, answer.Rejected.Count);
        return TypedResults.Accepted((string?)null, answer);
    }

    private static PushResponse Answer(string source, List<PushItemResult> items)
    {
        var rejected = items
            .Where(i => i.Outcome == PushItemResult.Rejected)
            .Select(i => new PushRejection(i.Index, i.Reason!, i.Detail!, i.Sensor))
            .ToList();
        return new PushResponse(source, items.Count - rejected.Count, rejected, items);
    }

    /// <summary>
    /// One result per item in request order: the parser's rejections, then each reading screened with the engine's
    /// own function (<see cref="ReadingScreen.Check(Core.Readings.Reading, AerodromeProfile, DateTimeOffset)"/>). Every
    /// parsed reading still goes to the engine, which screens it again and records it with its reason; the answer
    /// only tells the sender now. Without a running engine (a test setting) there is no profile and nothing to screen.
    /// </summary>
    private static List<PushItemResult> Screen(ReadingParseResult parsed, AerodromeProfile? profile, DateTimeOffset now)
    {
        var items = new List<PushItemResult>(parsed.Readings.Count + parsed.Rejections.Count);
        foreach (var r in parsed.Rejections)
        {
            items.Add(new PushItemResult(r.Index, r.SensorId, PushItemResult.Rejected, ReadingWireNames.ToWire(r.Reason), r.Detail));
        }

        for (var i = 0; i < parsed.Readings.Count; i++)
        {
            var reading = parsed.Readings[i];
            var index = i < parsed.Indexes.Count ? parsed.Indexes[i] : i;
            items.Add(profile is not null && ReadingScreen.Check(reading, profile, now) is { } rejection
                ? new PushItemResult(index, reading.SensorId, PushItemResult.Rejected, ReadingWireNames.ToWire(rejection.Reason), rejection.Detail)
                : new PushItemResult(index, reading.SensorId, PushItemResult.Accepted));
        }

        items.Sort((a, b) => a.Index.CompareTo(b.Index));
        return items;
    }

    private static async Task<BatchOutcome> WaitStoredAsync(BatchReceipt receipt, CancellationToken aborted)
    {
        try
        {
            return await receipt.Outcome.WaitAsync(StoreWait, aborted);
        }
        catch (TimeoutException)
        {
            return new BatchOutcome(false, $"not confirmed stored within {StoreWait.TotalSeconds:0} s");
        }
    }

    /// <summary>
    /// The body, or null when it is larger than <paramref name="maxBytes"/>. A body sent without a length (chunked) that
    /// runs over is read to its end and dropped, up to <see cref="DrainFactor"/> times the limit, so the sender gets
    /// its 413 instead of a connection reset while it is still sending (the fault suite's oversized bodies lost their
    /// answer that way, docs/reliability.md "Fault runs"); beyond that the connection is dropped.
    /// </summary>
    internal static async Task<byte[]?> ReadBodyAsync(HttpContext context, int maxBytes)
    {
        if (context.Request.ContentLength > maxBytes)
        {
            return null;
        }

        var sizeFeature = context.Features.Get<IHttpMaxRequestBodySizeFeature>();
        if (sizeFeature is { IsReadOnly: false })
        {
            sizeFeature.MaxRequestBodySize = (long)maxBytes * DrainFactor;
        }

        using var buffer = new MemoryStream();
        var chunk = new byte[16 * 1024];
        try
        {
            int read;
            while ((read = await context.Request.Body.ReadAsync(chunk, context.RequestAborted)) > 0)
            {
                if (buffer.Length + read > maxBytes)
                {
                    while (await context.Request.Body.ReadAsync(chunk, context.RequestAborted) > 0)
                    {
                    }

                    return null;
                }

                buffer.Write(chunk, 0, read);
            }
        }
        catch (BadHttpRequestException ex) when (ex.StatusCode == StatusCodes.Status413PayloadTooLarge)
        {
            return null;
        }

        return buffer.ToArray();
    }

    private static JsonHttpResult<ApiError> Unauthorized(HttpContext context, string error)
    {
        context.Response.Headers.WWWAuthenticate = $"ApiKey header=\"{ApiKeyHeader}\"";
        return Error(StatusCodes.Status401Unauthorized, error);
    }

    private static JsonHttpResult<ApiError> Error(int status, string error) => TypedResults.Json(new ApiError(error), statusCode: status);

    /// <summary>503 with <paramref name="error"/> and <c>Retry-After</c>: nothing was acknowledged, the feed keeps the readings and sends them again.</summary>
    private static JsonHttpResult<ApiError> RetryLater(HttpContext context, string error, int retryAfterSeconds = 5)
    {
        context.Response.Headers.RetryAfter = retryAfterSeconds.ToString(System.Globalization.CultureInfo.InvariantCulture);
        return Error(StatusCodes.Status503ServiceUnavailable, error);
    }
}
