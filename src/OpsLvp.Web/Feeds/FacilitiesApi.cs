using System.Text.Json;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Capability;
using OpsLvp.Core.Engine;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Facility ingest: <c>POST /api/facilities</c> with an <c>X-Api-Key</c> of the ingest scope (the same keys as
/// <c>POST /api/readings</c>, docs/access.md). A maintenance or lighting system reports facility statuses
/// (docs/capability.md "Facility ingest", docs/engine.md R30). Each entry is checked on its own and, when good, goes
/// through the engine's single evaluation path as a <see cref="SetFacilityStatus"/> of actor <c>ingest:{key name}</c>:
/// audited as <c>manual_action</c> <c>facility</c> like the console's report. A bad entry is answered with its reason
/// and logged; the other entries are still applied.
/// </summary>
public static class FacilitiesApi
{
    /// <summary>Longest reason accepted, in characters (a reason is a short note, not a document).</summary>
    public const int MaxReasonLength = 500;

    public static IEndpointRouteBuilder MapFacilitiesApi(this IEndpointRouteBuilder endpoints)
    {
        endpoints.MapPost("/api/facilities", PostFacilitiesAsync).DisableAntiforgery();
        return endpoints;
    }

    private static async Task<Results<Ok<FacilityReportResponse>, JsonHttpResult<ApiError>>> PostFacilitiesAsync(
        HttpContext context,
        IOptions<FeedsOptions> options,
        ApiKeyStore keys,
        LiveEngineHost engine,
        ILoggerFactory loggers)
    {
        var log = loggers.CreateLogger(typeof(FacilitiesApi).FullName!);
        var push = options.Value.Push;
        var caller = await IngestKeyCheck.CheckAsync(context, push, keys, "facility ingest");
        if (caller.Refusal is { } refusal)
        {
            return refusal;
        }

        var actor = "ingest:" + caller.KeyName;
        var body = await ReadingsApi.ReadBodyAsync(context, push.MaxBodyBytes);
        if (body is null)
        {
            return Error(StatusCodes.Status413PayloadTooLarge, $"request body exceeds Feeds:Push:MaxBodyBytes ({push.MaxBodyBytes} bytes)");
        }

        List<JsonElement> entries;
        try
        {
            using var document = JsonDocument.Parse(body);
            if (document.RootElement.ValueKind != JsonValueKind.Object
                || !document.RootElement.TryGetProperty("facilities", out var list)
                || list.ValueKind != JsonValueKind.Array)
            {
                log.LogWarning("Facility report from {Actor} refused: no facilities array", actor);
                return Error(StatusCodes.Status400BadRequest, "the body must be an object with a \"facilities\" array");
            }
            entries = list.EnumerateArray().Select(e => e.Clone()).ToList();
        }
        catch (JsonException ex)
        {
            log.LogWarning("Facility report from {Actor} refused: not JSON ({Error})", actor, ex.Message);
            return Error(StatusCodes.Status400BadRequest, $"the body is not valid JSON: {ex.Message}");
        }

        if (entries.Count > push.MaxReadings)
        {
            return Error(StatusCodes.Status413PayloadTooLarge, $"{entries.Count} entries, more than the {push.MaxReadings} allowed (Feeds:Push:MaxReadings)");
        }
        if (engine.Health.Stopped is { } stopped)
        {
            context.Response.Headers.RetryAfter = "60";
            return Error(StatusCodes.Status503ServiceUnavailable, $"not applied: the engine is stopped: {stopped}");
        }
        if (engine.Profile is not { } profile)
        {
            context.Response.Headers.RetryAfter = "60";
            return Error(StatusCodes.Status503ServiceUnavailable, "not applied: the engine is not running");
        }

        var items = new List<FacilityReportResult>(entries.Count);
        for (var i = 0; i < entries.Count; i++)
        {
            var result = await ApplyAsync(i, entries[i], actor, profile, engine, context.RequestAborted);
            if (result.Outcome == FacilityReportResult.Rejected)
            {
                log.LogWarning("Facility report {Index} from {Actor} rejected: {Reason}: {Detail}", i, actor, result.Reason, result.Detail);
            }
            items.Add(result);
        }

        var accepted = items.Count(r => r.Outcome == FacilityReportResult.Accepted);
        return TypedResults.Ok(new FacilityReportResponse(actor, accepted, items.Count - accepted, items));
    }

    /// <summary>Checks one entry and, when good, applies it through the engine host.</summary>
    private static async Task<FacilityReportResult> ApplyAsync(
        int index, JsonElement entry, string actor, Core.Profile.AerodromeProfile profile, LiveEngineHost engine, CancellationToken aborted)
    {
        if (entry.ValueKind != JsonValueKind.Object)
        {
            return Reject(index, null, "malformed", $"entry must be an object (got {Describe(entry.ValueKind)})");
        }

        var id = Text(entry, "facility", out var idProblem);
        if (idProblem is not null)
        {
            return Reject(index, null, "malformed", idProblem);
        }
        var statusText = Text(entry, "status", out var statusProblem);
        var reason = Text(entry, "reason", out var reasonProblem);
        if (statusProblem is not null || reasonProblem is not null)
        {
            return Reject(index, id, "malformed", statusProblem ?? reasonProblem!);
        }
        if (HasControl(id) || HasControl(statusText) || HasControl(reason))
        {
            return Reject(index, Printable(id), "control_characters", "facility, status and reason must not contain control characters");
        }
        var facility = profile.Capability?.Facilities.FirstOrDefault(f => f is not null && f.Id == id);
        if (facility is null)
        {
            return Reject(index, id, "unknown_facility", $"facility '{id}' is not in the profile");
        }
        FacilityStatus? status = statusText switch
        {
            "serviceable" => FacilityStatus.Serviceable,
            "degraded" => FacilityStatus.Degraded,
            "unserviceable" => FacilityStatus.Unserviceable,
            _ => null,
        };
        if (status is null)
        {
            return Reject(index, id, "unknown_status", $"status '{statusText}' is not one of serviceable, degraded, unserviceable");
        }
        if (string.IsNullOrWhiteSpace(reason))
        {
            return Reject(index, id, "missing_reason", "a reason is required to report a facility's status");
        }
        if (reason.Length > MaxReasonLength)
        {
            return Reject(index, id, "too_long", $"reason is {reason.Length} characters, more than {MaxReasonLength}");
        }

        var command = new SetFacilityStatus(actor, id!, status.Value, reason.Trim());
        if (CommandPreconditions.Check(command, profile) is { } invalid)
        {
            return Reject(index, id, "refused", invalid);
        }
        var outcome = await engine.ExecuteAsync(command, aborted);
        if (!outcome.Committed)
        {
            return Reject(index, id, "not_recorded", $"not applied: audit could not be recorded ({outcome.Error}); send it again");
        }
        var refused = outcome.Events.OfType<CommandRefused>().FirstOrDefault(r => ReferenceEquals(r.Command, command));
        return refused is not null
            ? Reject(index, id, "refused", refused.Reason)
            : new FacilityReportResult(index, id, FacilityReportResult.Accepted);
    }

    /// <summary>The string property <paramref name="name"/>; a missing or non-string property sets <paramref name="problem"/>.</summary>
    private static string? Text(JsonElement entry, string name, out string? problem)
    {
        problem = null;
        if (!entry.TryGetProperty(name, out var value) || value.ValueKind is JsonValueKind.Null)
        {
            problem = $"{name} is missing";
            return null;
        }
        if (value.ValueKind != JsonValueKind.String)
        {
            problem = $"{name} must be a string (got {Describe(value.ValueKind)})";
            return null;
        }
        return value.GetString();
    }

    private static bool HasControl(string? text) => text is not null && text.Any(char.IsControl);

    private static string? Printable(string? text) => text is null ? null : new string(text.Select(c => char.IsControl(c) ? '?' : c).ToArray());

    private static string Describe(JsonValueKind kind) => kind switch
    {
        JsonValueKind.Array => "an array",
        JsonValueKind.Object => "an object",
        JsonValueKind.Number => "a number",
        JsonValueKind.True or JsonValueKind.False => "a boolean",
        JsonValueKind.Null => "null",
        _ => "a string",
    };

    private static FacilityReportResult Reject(int index, string? facility, string reason, string detail) =>
        new(index, facility, FacilityReportResult.Rejected, reason, detail);

    private static JsonHttpResult<ApiError> Error(int status, string error) => TypedResults.Json(new ApiError(error), statusCode: status);
}
