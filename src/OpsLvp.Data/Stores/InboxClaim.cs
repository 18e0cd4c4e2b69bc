namespace OpsLvp.Data.Stores;

/// <summary>
/// The <c>reading_inbox</c> rows whose readings an insert stores (docs/engine.md R74): the insert deletes them in its own
/// transaction, and writes nothing when any of them is gone or <paramref name="Epoch"/> is no longer the current
/// leadership epoch. Null epoch: unfenced.
/// </summary>
public sealed record InboxClaim(IReadOnlyList<long> Ids, long? Epoch);
