namespace OpsLvp.Data.Entities;

/// <summary>
/// The single row of <c>engine_leadership</c> (id 1): the current leadership epoch, the fencing token every engine
/// append on PostgreSQL checks (docs/deployment.md "PostgreSQL and several nodes", docs/engine.md R70). A node that
/// wins leadership increments it in a transaction that takes the audit lock. Unused on SQLite (one node).
/// </summary>
public sealed class EngineLeadershipRow
{
    public const int SingleId = 1;

    /// <summary>Always <see cref="SingleId"/> (a check constraint enforces it).</summary>
    public int Id { get; set; } = SingleId;

    /// <summary>The epoch of the current leader; grows by one with each takeover.</summary>
    public long Epoch { get; set; }

    /// <summary>The node that took this epoch (<c>Cluster:NodeId</c>).</summary>
    public required string NodeId { get; set; }

    /// <summary>When it took it (UTC).</summary>
    public DateTimeOffset Since { get; set; }
}
