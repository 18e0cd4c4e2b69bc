namespace OpsLvp.Web.Access;

/// <summary>Outcome of a user administration action: done, or the reasons it was refused.</summary>
public sealed record UserAdminResult(bool Succeeded, IReadOnlyList<string> Errors)
{
    public static UserAdminResult Ok { get; } = new(true, []);

    /// <summary>The refusals that belong to one field of the form, by <see cref="UserAdminFields"/> name (messages joined with "; ").</summary>
    public IReadOnlyDictionary<string, string> FieldErrors { get; init; } = new Dictionary<string, string>();

    public static UserAdminResult Refused(params string[] errors) => new(false, errors);

    /// <summary>A refusal whose reasons each name their field.</summary>
    public static UserAdminResult Refused(IReadOnlyList<(string Field, string Message)> problems) =>
        new(false, problems.Select(p => p.Message).ToList())
        {
            FieldErrors = problems.GroupBy(p => p.Field, StringComparer.Ordinal)
                .ToDictionary(g => g.Key, g => string.Join("; ", g.Select(p => p.Message)), StringComparer.Ordinal),
        };
}
