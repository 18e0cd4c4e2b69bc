namespace OpsLvp.Core.Profile;

/// <summary>Every problem <see cref="ProfileValidator"/> found, in profile order; empty when the profile is usable.</summary>
public sealed record ValidationResult(IReadOnlyList<ValidationProblem> Problems)
{
    public bool IsValid => Problems.Count == 0;

    /// <summary>Whether some problem names exactly <paramref name="field"/>.</summary>
    public bool HasProblemAt(string field) => Problems.Any(p => p.Field == field);

    /// <inheritdoc />
    public override string ToString() =>
        IsValid ? "profile is valid" : string.Join(Environment.NewLine, Problems.Select(p => p.ToString()));
}
