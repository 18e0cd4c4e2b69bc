using System.Globalization;
using System.Security.Claims;
using Microsoft.AspNetCore.Identity;
using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Options;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Access;

/// <summary>
/// Decides whether an already-authenticated principal may keep its session: a user must still exist, be enabled,
/// carry the current security stamp and exactly its current roles and teams; a kiosk's display token and a
/// machine's API key must not be revoked. Used by circuits, the hub monitor and the display cookie.
/// </summary>
public sealed class AccessValidator(
    IDbContextFactory<OpsLvpDbContext> factory,
    DisplayTokenStore displayTokens,
    ApiKeyStore apiKeys,
    IOptions<IdentityOptions> identity)
{
    /// <summary>
    /// True while the principal may keep its session. False, not an exception, once the server is shutting down and
    /// its database services are disposed (circuits still open then are ending with the server anyway).
    /// </summary>
    public async Task<bool> IsStillValidAsync(ClaimsPrincipal principal, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(principal);
        if (principal.Identity is not { IsAuthenticated: true })
        {
            return true;
        }
        try
        {
            return await IsAuthenticatedStillValidAsync(principal, cancellationToken);
        }
        catch (ObjectDisposedException)
        {
            return false;
        }
    }

    private async Task<bool> IsAuthenticatedStillValidAsync(ClaimsPrincipal principal, CancellationToken cancellationToken)
    {
        if (principal.FindFirst(AccessClaims.DisplayToken) is { } display)
        {
            return long.TryParse(display.Value, NumberStyles.None, CultureInfo.InvariantCulture, out var id) && await displayTokens.IsActiveAsync(id, cancellationToken);
        }
        if (principal.FindFirst(AccessClaims.ApiKey) is { } key)
        {
            // Id 0 is a configuration bootstrap key: it lives as long as the configuration.
            return long.TryParse(key.Value, NumberStyles.None, CultureInfo.InvariantCulture, out var id) && (id == 0 || await apiKeys.IsActiveAsync(id, cancellationToken));
        }
        return await IsUserValidAsync(principal, cancellationToken);
    }

    private async Task<bool> IsUserValidAsync(ClaimsPrincipal principal, CancellationToken cancellationToken)
    {
        var claims = identity.Value.ClaimsIdentity;
        var userId = principal.FindFirstValue(claims.UserIdClaimType);
        if (userId is null)
        {
            return false;
        }
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var user = await db.Users.AsNoTracking().SingleOrDefaultAsync(u => u.Id == userId, cancellationToken);
        if (user is null || user.Disabled)
        {
            return false;
        }
        if (!string.Equals(principal.FindFirstValue(claims.SecurityStampClaimType), user.SecurityStamp, StringComparison.Ordinal))
        {
            return false;
        }
        var roles = await (from ur in db.UserRoles join r in db.Roles on ur.RoleId equals r.Id where ur.UserId == userId select r.Name).ToListAsync(cancellationToken);
        var teams = await db.UserClaims.Where(c => c.UserId == userId && c.ClaimType == CommandCaller.TeamClaimType).Select(c => c.ClaimValue).ToListAsync(cancellationToken);
        return SameSet(principal.FindAll(claims.RoleClaimType).Select(c => c.Value), roles)
            && SameSet(principal.FindAll(CommandCaller.TeamClaimType).Select(c => c.Value), teams);
    }

    private static bool SameSet(IEnumerable<string> held, IEnumerable<string?> current) =>
        held.ToHashSet(StringComparer.Ordinal).SetEquals(current.OfType<string>());
}
