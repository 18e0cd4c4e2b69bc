using System.Globalization;
using System.Security.Claims;
using Microsoft.AspNetCore.Authentication;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Access;

/// <summary>
/// <c>GET /display/{token}</c>: a kiosk opens its display link once; a valid token sets the display cookie (read-only
/// wall access, no role) and redirects to <c>/wall</c>. An unknown or revoked token gets 404 and no cookie.
/// </summary>
public static class AccessEndpoints
{
    public static IEndpointRouteBuilder MapAccessEndpoints(this IEndpointRouteBuilder endpoints)
    {
        endpoints.MapGet("/display/{token}", OpenDisplayAsync).AllowAnonymous();
        return endpoints;
    }

    private static async Task<IResult> OpenDisplayAsync(string token, HttpContext context, DisplayTokenStore tokens, AccessAudit audit, TimeProvider clock)
    {
        var found = await tokens.FindActiveAsync(token, clock.GetUtcNow(), context.RequestAborted);
        if (found is null)
        {
            await context.SignOutAsync(AccessSchemes.Display);
            return TypedResults.NotFound("This display link is unknown or has been revoked.");
        }
        var principal = new ClaimsPrincipal(new ClaimsIdentity(
            [
                new Claim(ClaimTypes.Name, "display:" + found.Name),
                new Claim(AccessClaims.DisplayToken, found.Id.ToString(CultureInfo.InvariantCulture)),
            ],
            AccessSchemes.Display));
        try
        {
            await audit.AppendAsync("display:" + found.Name, AccessAuditKinds.DisplaySignIn, new { display = found.Name, id = found.Id }, context.RequestAborted);
        }
        catch (AuditCommitException)
        {
            return TypedResults.Problem("The display sign-in could not be recorded in the audit log; try again.", statusCode: StatusCodes.Status503ServiceUnavailable);
        }
        await context.SignInAsync(AccessSchemes.Display, principal, new AuthenticationProperties { IsPersistent = true });
        return TypedResults.Redirect("/wall");
    }
}
