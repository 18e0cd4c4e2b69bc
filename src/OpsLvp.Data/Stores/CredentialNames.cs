namespace OpsLvp.Data.Stores;

/// <summary>Checks the name an administrator gives a display token or API key.</summary>
public static class CredentialNames
{
    public const int MaxLength = 100;

    /// <summary>The trimmed name.</summary>
    /// <exception cref="ArgumentException">Empty, too long, or containing control characters.</exception>
    public static string Check(string? name)
    {
        var trimmed = name?.Trim() ?? "";
        if (trimmed.Length == 0)
        {
            throw new ArgumentException("a name is required", nameof(name));
        }
        if (trimmed.Length > MaxLength)
        {
            throw new ArgumentException($"the name is longer than {MaxLength} characters", nameof(name));
        }
        if (trimmed.Any(char.IsControl))
        {
            throw new ArgumentException("the name contains control characters", nameof(name));
        }
        return trimmed;
    }
}
