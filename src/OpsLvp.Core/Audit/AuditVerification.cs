namespace OpsLvp.Core.Audit;

/// <summary>Outcome of verifying an audit chain.</summary>
/// <param name="Entries">How many entries were read (all of them, also those after a failure).</param>
/// <param name="Ok">True when every entry checked out.</param>
/// <param name="FirstBadSequence">
/// The first sequence number that cannot be trusted: the entry's own sequence for a hash mismatch, broken link,
/// duplicate or malformed entry; the missing (expected) sequence for a gap. Null when <paramref name="Ok"/>.
/// </param>
/// <param name="Failure">Why; null when <paramref name="Ok"/>.</param>
/// <param name="Detail">One line for people, e.g. "expected sequence 3, found 4"; null when <paramref name="Ok"/>.</param>
/// <param name="FirstTimeRegressionSequence">
/// The first entry whose time is earlier than its predecessor's, or null. Not a failure: a wall clock stepped
/// back (time sync) is real, and altering a time would break the hash anyway. Reported for review only.
/// Only entries before the first failure are looked at.
/// </param>
public sealed record AuditVerification(
    long Entries,
    bool Ok,
    long? FirstBadSequence,
    AuditFailure? Failure,
    string? Detail,
    long? FirstTimeRegressionSequence);
