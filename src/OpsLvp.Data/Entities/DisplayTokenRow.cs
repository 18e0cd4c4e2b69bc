namespace OpsLvp.Data.Entities;

/// <summary>Row of <c>display_tokens</c>: a named read-only wall link for a kiosk. Only the SHA-256 of the token is kept.</summary>
public sealed class DisplayTokenRow : ISecretRow
{
    public long Id { get; set; }

    public required string Name { get; set; }

    /// <summary>Lower-case hex SHA-256 of the token text.</summary>
    public required string TokenHash { get; set; }

    public required string CreatedBy { get; set; }

    public DateTimeOffset CreatedAt { get; set; }

    public DateTimeOffset? RevokedAt { get; set; }

    public DateTimeOffset? LastUsedAt { get; set; }
}
