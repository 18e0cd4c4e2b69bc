using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Http.HttpResults;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// The <c>X-Api-Key</c> check of the ingest endpoints (docs/feeds.md, docs/access.md): 401 with a reason and a
/// <c>WWW-Authenticate</c> header when ingest has no keys at all, the header is missing or matches no key; 403 when the
/// key lacks the ingest scope; else the key's name. <c>/api/forecasts</c> and <c>/api/facilities</c> use it;
/// <c>/api/readings</c> still has its own copy of the same check and can adopt this one.
/// </summary>
public static class IngestKeyCheck
{
    /// <param name="disabledWhat">What the 401 says is disabled when no key exists ("push ingest", "facility ingest").</param>
    public static async Task<IngestCaller> CheckAsync(HttpContext context, PushIngestOptions push, ApiKeyStore keys, string disabledWhat)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(push);
        ArgumentNullException.ThrowIfNull(keys);
        var auth = await context.AuthenticateAsync(AccessSchemes.ApiKey);
        if (!auth.Succeeded)
        {
            if (push.ApiKeys.Count == 0 && !await keys.AnyActiveAsync(ApiKeyStore.IngestScope, context.RequestAborted))
            {
                return Refuse(Unauthorized(context, $"{disabledWhat} is disabled: no keys are configured in Feeds:Push:ApiKeys or issued on /admin/keys"));
            }
            return Refuse(context.Request.Headers[ReadingsApi.ApiKeyHeader].ToString().Length == 0
                ? Unauthorized(context, $"missing {ReadingsApi.ApiKeyHeader} header")
                : Unauthorized(context, $"the {ReadingsApi.ApiKeyHeader} header does not match any configured key"));
        }
        if (!auth.Principal.HasClaim(AccessClaims.Scope, ApiKeyStore.IngestScope))
        {
            return Refuse(TypedResults.Json(new ApiError("this API key does not have the ingest scope"), statusCode: StatusCodes.Status403Forbidden));
        }
        return new IngestCaller((auth.Principal.Identity?.Name ?? "key:unknown")["key:".Length..], null);
    }

    private static IngestCaller Refuse(JsonHttpResult<ApiError> answer) => new(null, answer);

    private static JsonHttpResult<ApiError> Unauthorized(HttpContext context, string error)
    {
        context.Response.Headers.WWWAuthenticate = $"ApiKey header=\"{ReadingsApi.ApiKeyHeader}\"";
        return TypedResults.Json(new ApiError(error), statusCode: StatusCodes.Status401Unauthorized);
    }
}
