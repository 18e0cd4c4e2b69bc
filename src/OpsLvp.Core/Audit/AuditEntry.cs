namespace OpsLvp.Core.Audit;

/// <summary>
/// One append-only audit entry (docs/engine.md R12). Built by <see cref="AuditChain.Append(AuditChainHead?, PendingAuditEntry)"/>, checked by
/// <see cref="AuditChain.Verify"/>; the bytes that are hashed are defined by <see cref="AuditCanonical"/>
/// and documented in docs/audit.md.
/// </summary>
/// <param name="Sequence">Position in the chain, 1 for the first entry, no gaps.</param>
/// <param name="Time">When the entry was made; the instant counts, the offset does not (hashed as UTC).</param>
/// <param name="Actor">Who acted: a user name, or a system actor such as "engine" or "feed:metar".</param>
/// <param name="Kind">What happened, e.g. "transition", "tick", "alarm.raise".</param>
/// <param name="PayloadJson">Details as JSON text, stored as given; hashed in canonical form.</param>
/// <param name="PreviousHash">Hash of the entry before, or <see cref="AuditChain.GenesisHash"/> for sequence 1; lowercase hex.</param>
/// <param name="Hash">SHA-256 over <paramref name="PreviousHash"/> and the canonical entry, lowercase hex (64 characters).</param>
public sealed record AuditEntry(
    long Sequence,
    DateTimeOffset Time,
    string Actor,
    string Kind,
    string PayloadJson,
    string PreviousHash,
    string Hash);
