namespace OpsLvp.Core.Profile;

/// <summary>A profile that cannot be used, with the field (JSON path) at fault.</summary>
public sealed class ProfileException(string field, string message) : Exception($"{field}: {message}")
{
    /// <summary>The field at fault, as a JSON path such as <c>thresholds.active.rvrRecoverM</c>.</summary>
    public string Field { get; } = field;
}
