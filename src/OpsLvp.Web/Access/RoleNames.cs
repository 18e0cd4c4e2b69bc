using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Access;

/// <summary>What people read for each role (claims and policies keep the ids of <see cref="Roles"/>).</summary>
public static class RoleNames
{
    /// <summary>"Duty manager" for <c>duty_manager</c>; an unknown id is shown as it is.</summary>
    public static string Of(string role) => role switch
    {
        Roles.Administrator => "Administrator",
        Roles.DutyManager => "Duty manager",
        Roles.GroundStaff => "Ground staff",
        Roles.Viewer => "Viewer",
        _ => role,
    };
}
