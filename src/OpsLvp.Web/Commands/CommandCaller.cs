using System.Security.Claims;

namespace OpsLvp.Web.Commands;

/// <summary>
/// Who asks for a command, taken from the signed-in principal: name, roles (<see cref="Roles"/>) and teams
/// (claims of type <see cref="TeamClaimType"/>, values are profile team ids).
/// </summary>
public sealed record CommandCaller(string Name, IReadOnlySet<string> Roles, IReadOnlySet<string> Teams, bool Authenticated)
{
    /// <summary>Claim type carrying a profile team id for ground staff.</summary>
    public const string TeamClaimType = "opslvp:team";

    /// <summary>Nobody signed in.</summary>
    public static CommandCaller Anonymous { get; } = new("anonymous", new HashSet<string>(), new HashSet<string>(), false);

    /// <summary>Reads name, role claims and team claims from a principal.</summary>
    public static CommandCaller FromPrincipal(ClaimsPrincipal? principal)
    {
        if (principal?.Identity is not { IsAuthenticated: true } identity)
        {
            return Anonymous;
        }
        var roles = principal.FindAll(ClaimTypes.Role).Select(c => c.Value).ToHashSet(StringComparer.Ordinal);
        var teams = principal.FindAll(TeamClaimType).Select(c => c.Value).ToHashSet(StringComparer.Ordinal);
        return new(identity.Name ?? "unknown", roles, teams, true);
    }

    public bool IsInRole(string role) => Roles.Contains(role);
}
