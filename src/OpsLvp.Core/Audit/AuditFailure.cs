namespace OpsLvp.Core.Audit;

/// <summary>Why <see cref="AuditChain.Verify"/> stopped trusting the chain.</summary>
public enum AuditFailure
{
    /// <summary>The stored hash differs from SHA-256(previous hash ‖ canonical entry): the entry was altered.</summary>
    HashMismatch,
    /// <summary>The entry's previous hash is not the hash of the entry before it (or not the genesis value for sequence 1).</summary>
    BrokenLink,
    /// <summary>A sequence number is missing (or the first entry is not 1): an entry was removed or moved.</summary>
    SequenceGap,
    /// <summary>A sequence number repeats or goes back: an entry was duplicated or moved.</summary>
    SequenceDuplicate,
    /// <summary>A field cannot be canonicalised: payload not JSON, empty actor or kind, hash not 64 lowercase hex digits.</summary>
    MalformedEntry,
}
