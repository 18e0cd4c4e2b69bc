namespace OpsLvp.Core.Profile;

/// <summary>A profile that cannot be used, with the field (JSON path) at fault; after validation, every problem found.</summary>
public sealed class ProfileException : Exception
{
    public ProfileException(string field, string message)
        : this([new ValidationProblem(field, message)])
    {
    }

    /// <summary>A profile refused by <see cref="ProfileValidator"/>; <paramref name="problems"/> must not be empty.</summary>
    public ProfileException(IReadOnlyList<ValidationProblem> problems)
        : base(FormatMessage(problems))
    {
        Problems = problems;
        Field = problems[0].Field;
    }

    /// <summary>The (first) field at fault, as a JSON path such as <c>thresholds.active.rvrRecoverM</c>.</summary>
    public string Field { get; }

    /// <summary>Every problem found (one for parse errors).</summary>
    public IReadOnlyList<ValidationProblem> Problems { get; }

    private static string FormatMessage(IReadOnlyList<ValidationProblem> problems)
    {
        ArgumentOutOfRangeException.ThrowIfZero(problems.Count);
        return problems.Count == 1
            ? problems[0].ToString()
            : $"profile has {problems.Count} problems:{Environment.NewLine}"
              + string.Join(Environment.NewLine, problems.Select(p => "  " + p));
    }
}
