using System.Security.Claims;

namespace OpsLvp.Web.Access;

/// <summary>Authorisation policy names used on pages, endpoints and the hub.</summary>
public static class AccessPolicies
{
    /// <summary>Duty manager console.</summary>
    public const string Console = "console";

    /// <summary>Checklist tablets: ground staff or duty manager.</summary>
    public const string Actions = "actions";

    /// <summary>Administration pages: administrator.</summary>
    public const string Admin = "admin";

    /// <summary>The wall: any role, or a display token.</summary>
    public const string Wall = "wall";

    /// <summary>
    /// Post-event review pages and <c>/api/episodes</c>: any signed-in account (the safety/review team uses viewer
    /// accounts); not a display link and not an API key.
    /// </summary>
    public const string Review = "review";

    /// <summary>Hub and read APIs: any role, a display token, or an API key with the hub-read scope.</summary>
    public const string HubRead = "hub-read";

    /// <summary>Push ingest: an API key with the ingest scope.</summary>
    public const string Ingest = "ingest";

    /// <summary>
    /// Who sees live operational data on a page (the <see cref="Wall"/> rule): any role or a display token. Anonymous
    /// pages (sign-in, home, setup, sign-out, error pages) show none of it (docs/access.md).
    /// </summary>
    public static bool MayViewLiveData(ClaimsPrincipal? user) =>
        user is not null && (AccessServiceCollectionExtensions.HasAnyRole(user) || user.HasClaim(c => c.Type == AccessClaims.DisplayToken));
}
