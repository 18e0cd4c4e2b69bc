namespace OpsLvp.Web.Commands;

/// <summary>Role names used in claims, policies and the command service.</summary>
public static class Roles
{
    public const string Administrator = "administrator";
    public const string DutyManager = "duty_manager";
    public const string GroundStaff = "ground_staff";
    public const string Viewer = "viewer";
}
