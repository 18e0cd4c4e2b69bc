namespace OpsLvp.Data.Entities;

/// <summary>A stored credential kept as the hash of its secret: revocable, with its last use recorded.</summary>
public interface ISecretRow
{
    DateTimeOffset? RevokedAt { get; set; }

    DateTimeOffset? LastUsedAt { get; set; }
}
