namespace OpsLvp.Data.Entities;

/// <summary>
/// One reading batch pushed to a standby node, waiting in <c>reading_inbox</c> for the leader (docs/deployment.md
/// "Readings from any node"; docs/engine.md R73). A queue, not a record: the leader deletes the row in the transaction
/// that stores its readings. Stays empty on SQLite (one node).
/// </summary>
public sealed class ReadingInboxRow
{
    /// <summary>Insertion order: the leader drains the inbox by ascending id.</summary>
    public long Id { get; set; }

    /// <summary>App-clock instant the standby received the batch (UTC).</summary>
    public DateTimeOffset ReceivedAt { get; set; }

    /// <summary>The feed, as a push to the leader names it (<c>push:{key name}</c>).</summary>
    public required string Source { get; set; }

    /// <summary>The node that took the batch (<c>Cluster:NodeId</c>).</summary>
    public required string NodeId { get; set; }

    /// <summary>The request body as received (UTF-8 JSON, already parsed once by the standby); the leader parses it again with the same parser.</summary>
    public required string Body { get; set; }

    /// <summary>Readings the standby answered as accepted.</summary>
    public int Accepted { get; set; }

    /// <summary>Items the standby answered as rejected.</summary>
    public int Rejected { get; set; }

    /// <summary>
    /// Failed attempts to evaluate this batch alone, counted by whichever node led at each (docs/engine.md R82): kept
    /// here, not in a leader's memory, so a new leader goes on counting.
    /// </summary>
    public int Attempts { get; set; }

    /// <summary>The error of the last failed attempt, clipped (docs/engine.md R82); null before the first.</summary>
    public string? LastError { get; set; }
}
