using System.Security.Cryptography;
using System.Text;

namespace OpsLvp.Core.Audit;

/// <summary>
/// The hash chain of the audit log (docs/engine.md R12): hash = SHA-256(previous hash ‖ canonical entry), bytes as
/// defined by <see cref="AuditCanonical"/>. Verification can prove that a stored chain was not altered,
/// shortened in the middle or reordered; it cannot detect a wholesale rewrite of the tail, nor a removal of the
/// last entries (compare the count with an outside record for that; docs/audit.md).
/// </summary>
public static class AuditChain
{
    /// <summary>The previous hash of entry 1: 64 zeros.</summary>
    public static readonly string GenesisHash = new('0', 64);

    /// <summary>
    /// Makes the entry that follows <paramref name="previous"/> (null for the first entry). The time is kept as the
    /// UTC instant; it may be earlier than the previous entry's (a clock stepped back), which verification reports
    /// but does not fail.
    /// </summary>
    /// <exception cref="ArgumentException">Empty actor or kind, payload not JSON, or a string not valid UTF-16.</exception>
    public static AuditEntry Append(AuditEntry? previous, DateTimeOffset time, string actor, string kind, string payloadJson) =>
        Append(previous is null ? null : new AuditChainHead(previous.Sequence, previous.Hash), Prepare(time, actor, kind, payloadJson));

    /// <summary>Checks and canonicalises an entry once, ahead of chaining it (see <see cref="PendingAuditEntry"/>).</summary>
    /// <exception cref="ArgumentException">Empty actor or kind, payload not JSON, or a string not valid UTF-16.</exception>
    public static PendingAuditEntry Prepare(DateTimeOffset time, string actor, string kind, string payloadJson)
    {
        ArgumentNullException.ThrowIfNull(actor);
        ArgumentNullException.ThrowIfNull(kind);
        ArgumentNullException.ThrowIfNull(payloadJson);
        var utc = time.ToUniversalTime();
        return new PendingAuditEntry(utc, actor, kind, payloadJson, AuditCanonical.FieldsAfterSequence(utc, actor, kind, payloadJson));
    }

    /// <summary>Makes the entry that follows <paramref name="head"/> (null for the first entry) from a prepared one.</summary>
    /// <exception cref="ArgumentException">The head's hash is not 64 lowercase hex digits.</exception>
    public static AuditEntry Append(AuditChainHead? head, PendingAuditEntry entry)
    {
        ArgumentNullException.ThrowIfNull(entry);
        var sequence = head is { } h ? checked(h.Sequence + 1) : 1;
        var previousHash = head?.Hash ?? GenesisHash;
        if (!IsHash(previousHash))
        {
            throw new ArgumentException("previous hash must be 64 lowercase hex digits", nameof(head));
        }
        using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        AppendAscii(sha, previousHash);
        sha.AppendData(AuditCanonical.EntryPrefix(sequence));
        sha.AppendData(entry.FieldsAfterSequence);
        var hash = Convert.ToHexStringLower(sha.GetHashAndReset());
        return new AuditEntry(sequence, entry.Time, entry.Actor, entry.Kind, entry.PayloadJson, previousHash, hash);
    }

    /// <summary>Recomputes an entry's hash from its fields and its <see cref="AuditEntry.PreviousHash"/>.</summary>
    /// <exception cref="ArgumentException">The entry cannot be canonicalised.</exception>
    public static string ComputeHash(AuditEntry entry)
    {
        ArgumentNullException.ThrowIfNull(entry);
        return ComputeHash(entry.PreviousHash, AuditCanonical.EntryBytes(entry.Sequence, entry.Time, entry.Actor, entry.Kind, entry.PayloadJson));
    }

    /// <summary>Lowercase hex of SHA-256(ASCII of <paramref name="previousHash"/> ‖ <paramref name="canonicalEntry"/>).</summary>
    /// <exception cref="ArgumentException"><paramref name="previousHash"/> is not 64 lowercase hex digits.</exception>
    public static string ComputeHash(string previousHash, ReadOnlySpan<byte> canonicalEntry)
    {
        if (!IsHash(previousHash))
        {
            throw new ArgumentException("previous hash must be 64 lowercase hex digits", nameof(previousHash));
        }
        using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        AppendAscii(sha, previousHash);
        sha.AppendData(canonicalEntry);
        return Convert.ToHexStringLower(sha.GetHashAndReset());
    }

    /// <summary>True for exactly 64 characters 0-9 a-f.</summary>
    public static bool IsHash(string? value) =>
        value is { Length: 64 } && value.All(c => char.IsAsciiDigit(c) || c is >= 'a' and <= 'f');

    /// <summary>
    /// Checks a whole chain, read once in the order given (which must be sequence order, as stored).
    /// Names the first entry that cannot be trusted; see <see cref="AuditVerification"/>.
    /// </summary>
    public static AuditVerification Verify(IEnumerable<AuditEntry> entries)
    {
        ArgumentNullException.ThrowIfNull(entries);
        var verifier = new AuditChainVerifier();
        foreach (var entry in entries)
        {
            verifier.Observe(entry);
        }
        return verifier.Result;
    }

    private static void AppendAscii(IncrementalHash sha, string hex)
    {
        Span<byte> bytes = stackalloc byte[64];
        var written = Encoding.ASCII.GetBytes(hex, bytes);
        sha.AppendData(bytes[..written]);
    }
}
