using System.Globalization;
using System.Security.Claims;
using System.Text.Encodings.Web;
using Microsoft.AspNetCore.Authentication;
using Microsoft.Extensions.Options;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Access;

/// <summary>
/// Authenticates <c>X-Api-Key</c>: a key issued on /admin/keys (scopes as stored) or a configuration bootstrap key in
/// <c>Feeds:Push:ApiKeys</c> (scope ingest only; for automation and tests). The principal is named
/// <c>key:{name}</c> and carries <see cref="AccessClaims.Scope"/> claims and no role.
/// </summary>
public sealed class ApiKeyAuthenticationHandler(
    IOptionsMonitor<AuthenticationSchemeOptions> options,
    ILoggerFactory logger,
    UrlEncoder encoder,
    ApiKeyStore keys,
    IOptions<FeedsOptions> feeds,
    TimeProvider clock)
    : AuthenticationHandler<AuthenticationSchemeOptions>(options, logger, encoder)
{
    public const string Header = ReadingsApi.ApiKeyHeader;

    /// <summary>Set on the request when a presented key matches nothing, so endpoints can say so.</summary>
    public const string NoMatchItem = "opslvp:api-key-no-match";

    protected override async Task<AuthenticateResult> HandleAuthenticateAsync()
    {
        var presented = Request.Headers[Header].ToString();
        if (presented.Length == 0)
        {
            return AuthenticateResult.NoResult();
        }
        if (PushKeys.Match(feeds.Value.Push.ApiKeys, presented) is { } bootstrapName)
        {
            return Success(bootstrapName, 0, [ApiKeyStore.IngestScope]);
        }
        var key = await keys.FindActiveAsync(presented, clock.GetUtcNow(), Context.RequestAborted);
        if (key is null)
        {
            Context.Items[NoMatchItem] = true;
            return AuthenticateResult.Fail($"the {Header} header does not match any configured key");
        }
        return Success(key.Name, key.Id, key.Scopes);
    }

    protected override Task HandleChallengeAsync(AuthenticationProperties properties)
    {
        Response.StatusCode = StatusCodes.Status401Unauthorized;
        Response.Headers.WWWAuthenticate = $"ApiKey header=\"{Header}\"";
        return Task.CompletedTask;
    }

    private AuthenticateResult Success(string name, long id, IEnumerable<string> scopes)
    {
        var claims = new List<Claim>
        {
            new(ClaimTypes.Name, "key:" + name),
            new(AccessClaims.ApiKey, id.ToString(CultureInfo.InvariantCulture)),
        };
        claims.AddRange(scopes.Select(s => new Claim(AccessClaims.Scope, s)));
        var principal = new ClaimsPrincipal(new ClaimsIdentity(claims, Scheme.Name));
        return AuthenticateResult.Success(new AuthenticationTicket(principal, Scheme.Name));
    }
}
