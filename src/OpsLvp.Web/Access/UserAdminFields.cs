namespace OpsLvp.Web.Access;

/// <summary>The fields of the user form a refusal can point at (<see cref="UserAdminResult.FieldErrors"/>).</summary>
public static class UserAdminFields
{
    public const string UserName = "userName";
    public const string Password = "password";
    public const string Roles = "roles";
    public const string Teams = "teams";
}
