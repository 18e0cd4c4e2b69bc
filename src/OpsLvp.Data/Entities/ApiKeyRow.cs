namespace OpsLvp.Data.Entities;

/// <summary>Row of <c>api_keys</c>: a named, scoped key for machine clients. Only the SHA-256 of the key is kept.</summary>
public sealed class ApiKeyRow : ISecretRow
{
    public long Id { get; set; }

    public required string Name { get; set; }

    /// <summary>Lower-case hex SHA-256 of the key text.</summary>
    public required string KeyHash { get; set; }

    /// <summary>Space-separated scopes, e.g. <c>ingest hub-read</c>.</summary>
    public required string Scopes { get; set; }

    public required string CreatedBy { get; set; }

    public DateTimeOffset CreatedAt { get; set; }

    public DateTimeOffset? RevokedAt { get; set; }

    public DateTimeOffset? LastUsedAt { get; set; }
}
