namespace OpsLvp.Web.Access;

/// <summary>Outcome of a user administration action: done, or the reasons it was refused.</summary>
public sealed record UserAdminResult(bool Succeeded, IReadOnlyList<string> Errors)
{
    public static UserAdminResult Ok { get; } = new(true, []);

    public static UserAdminResult Refused(params string[] errors) => new(false, errors);
}
