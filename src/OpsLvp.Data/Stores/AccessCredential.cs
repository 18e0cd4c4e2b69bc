namespace OpsLvp.Data.Stores;

/// <summary>A display token or API key as listed to administrators (never the secret itself).</summary>
/// <param name="Scopes">API key scopes; empty for display tokens.</param>
public sealed record AccessCredential(
    long Id,
    string Name,
    IReadOnlyList<string> Scopes,
    string CreatedBy,
    DateTimeOffset CreatedAt,
    DateTimeOffset? RevokedAt,
    DateTimeOffset? LastUsedAt)
{
    public bool Active => RevokedAt is null;
}
