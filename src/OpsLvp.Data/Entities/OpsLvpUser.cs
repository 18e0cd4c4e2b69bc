using Microsoft.AspNetCore.Identity;

namespace OpsLvp.Data.Entities;

/// <summary>
/// A person who signs in (table <c>users</c>). Roles live in <c>roles</c>/<c>user_roles</c>; the profile teams of
/// ground staff are user claims of type <c>opslvp:team</c>.
/// </summary>
public sealed class OpsLvpUser : IdentityUser
{
    public string DisplayName { get; set; } = "";

    /// <summary>A disabled account cannot sign in, and its open sessions end at the next revalidation.</summary>
    public bool Disabled { get; set; }

    /// <summary>Seeded by demo mode from <c>seed-demo/users.json</c>; such accounts are disabled outside demo mode.</summary>
    public bool IsDemo { get; set; }

    public DateTimeOffset CreatedAt { get; set; }
}
