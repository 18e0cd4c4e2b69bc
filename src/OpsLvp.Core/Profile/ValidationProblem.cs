namespace OpsLvp.Core.Profile;

/// <summary>One thing wrong with a profile.</summary>
/// <param name="Field">The field at fault as a JSON path, e.g. <c>thresholds.active.rvrRecoverM</c> or <c>sensors[3].runway</c>.</param>
/// <param name="Message">What is wrong and what is expected.</param>
public sealed record ValidationProblem(string Field, string Message)
{
    /// <inheritdoc />
    public override string ToString() => $"{Field}: {Message}";
}
