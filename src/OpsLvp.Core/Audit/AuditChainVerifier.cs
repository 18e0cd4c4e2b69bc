using System.Globalization;

namespace OpsLvp.Core.Audit;

/// <summary>
/// Streaming form of <see cref="AuditChain.Verify"/>: feed entries in stored order with <see cref="Observe"/>,
/// read <see cref="Result"/> at any point. Holds only the previous entry, so a chain of any length fits in memory.
/// Checks per entry, in this order: sequence (must be previous + 1, first 1), link (previous hash equals the
/// previous entry's hash, first equals <see cref="AuditChain.GenesisHash"/>), form (hash is 64 lowercase hex,
/// fields canonicalise), hash (stored equals recomputed). After the first failure entries are only counted.
/// </summary>
public sealed class AuditChainVerifier
{
    private AuditEntry? _previous;
    private long _count;
    private long? _firstBad;
    private AuditFailure? _failure;
    private string? _detail;
    private long? _firstTimeRegression;

    /// <summary>Takes the next entry in stored order.</summary>
    public void Observe(AuditEntry entry)
    {
        ArgumentNullException.ThrowIfNull(entry);
        _count++;
        if (_failure is not null)
        {
            return;
        }
        if (!SequenceFollows(entry.Sequence))
        {
            return;
        }
        var expectedLink = _previous?.Hash ?? AuditChain.GenesisHash;
        if (!string.Equals(entry.PreviousHash, expectedLink, StringComparison.Ordinal))
        {
            Fail(entry.Sequence, AuditFailure.BrokenLink, _previous is null
                ? "first entry's previous hash is not the genesis value"
                : string.Create(CultureInfo.InvariantCulture, $"previous hash does not match the hash of entry {_previous.Sequence}"));
            return;
        }
        if (!AuditChain.IsHash(entry.Hash))
        {
            Fail(entry.Sequence, AuditFailure.MalformedEntry, "hash is not 64 lowercase hex digits");
            return;
        }
        string recomputed;
        try
        {
            recomputed = AuditChain.ComputeHash(entry);
        }
        catch (ArgumentException ex)
        {
            Fail(entry.Sequence, AuditFailure.MalformedEntry, ex.Message.ReplaceLineEndings(" "));
            return;
        }
        if (!string.Equals(recomputed, entry.Hash, StringComparison.Ordinal))
        {
            Fail(entry.Sequence, AuditFailure.HashMismatch, "stored hash differs from the hash of the entry's content");
            return;
        }
        if (_previous is not null && entry.Time < _previous.Time)
        {
            _firstTimeRegression ??= entry.Sequence;
        }
        _previous = entry;
    }

    /// <summary>
    /// Takes a stored entry that could not even be read into an <see cref="AuditEntry"/> (e.g. a time column that is
    /// not a time): counts it, and fails it as <see cref="AuditFailure.MalformedEntry"/> unless an earlier entry failed
    /// (a sequence fault found first still wins).
    /// </summary>
    public void ObserveUnreadable(long sequence, string detail)
    {
        ArgumentNullException.ThrowIfNull(detail);
        _count++;
        if (_failure is not null)
        {
            return;
        }
        if (SequenceFollows(sequence))
        {
            Fail(sequence, AuditFailure.MalformedEntry, detail);
        }
    }

    /// <summary>The verdict over the entries observed so far (ok for none).</summary>
    public AuditVerification Result => new(_count, _failure is null, _firstBad, _failure, _detail, _firstTimeRegression);

    private bool SequenceFollows(long sequence)
    {
        var expected = _previous is null ? 1 : _previous.Sequence + 1;
        if (sequence > expected)
        {
            Fail(expected, AuditFailure.SequenceGap, string.Create(CultureInfo.InvariantCulture, $"expected sequence {expected}, found {sequence}"));
            return false;
        }
        if (sequence < expected)
        {
            Fail(sequence, AuditFailure.SequenceDuplicate, string.Create(CultureInfo.InvariantCulture, $"expected sequence {expected}, found {sequence} again or out of order"));
            return false;
        }
        return true;
    }

    private void Fail(long sequence, AuditFailure failure, string detail)
    {
        _firstBad = sequence;
        _failure = failure;
        _detail = string.Create(CultureInfo.InvariantCulture, $"entry {sequence}: {detail}");
    }
}
