namespace OpsLvp.Web.Access;

/// <summary>An account as listed on /admin/users.</summary>
public sealed record UserSummary(
    string Id,
    string UserName,
    string DisplayName,
    IReadOnlyList<string> Roles,
    IReadOnlyList<string> Teams,
    bool Disabled,
    bool IsDemo,
    DateTimeOffset? LockedUntil);
