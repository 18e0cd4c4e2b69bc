namespace OpsLvp.Core.Audit;

/// <summary>
/// An audit entry that has been checked and canonicalised but not yet chained: made by
/// <see cref="AuditChain.Prepare"/>, chained by <see cref="AuditChain.Append(AuditChainHead?, PendingAuditEntry)"/>.
/// A store prepares its entries before it takes its write lock, so a bad entry is refused without touching the
/// database and each payload is canonicalised once.
/// </summary>
public sealed class PendingAuditEntry
{
    internal PendingAuditEntry(DateTimeOffset time, string actor, string kind, string payloadJson, byte[] fieldsAfterSequence)
    {
        Time = time;
        Actor = actor;
        Kind = kind;
        PayloadJson = payloadJson;
        FieldsAfterSequence = fieldsAfterSequence;
    }

    /// <summary>The instant as UTC.</summary>
    public DateTimeOffset Time { get; }

    public string Actor { get; }

    public string Kind { get; }

    /// <summary>The payload as given (stored as is; hashed in canonical form).</summary>
    public string PayloadJson { get; }

    /// <summary>The netstrings of time, actor, kind and canonical payload: the canonical entry after the sequence.</summary>
    internal byte[] FieldsAfterSequence { get; }
}
