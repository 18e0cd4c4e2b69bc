using OpsLvp.Core.Audit;

namespace OpsLvp.Data.Copy;

/// <summary>What <see cref="SqliteToPostgresCopy"/> copied: rows per table, and the audit chain verified on the target.</summary>
/// <param name="Rows">Rows copied per table, in copy order.</param>
/// <param name="TargetVerification">The audit chain as read back from the target.</param>
/// <param name="SourceHeadHash">The hash of the last audit entry in the source (null for an empty chain).</param>
/// <param name="TargetHeadHash">The hash of the last audit entry in the target (null for an empty chain).</param>
public sealed record DatabaseCopyResult(
    IReadOnlyList<KeyValuePair<string, long>> Rows,
    AuditVerification TargetVerification,
    string? SourceHeadHash,
    string? TargetHeadHash)
{
    /// <summary>The target's chain verifies, holds every entry and ends on the source's head.</summary>
    public bool Ok => TargetVerification.Ok && string.Equals(SourceHeadHash, TargetHeadHash, StringComparison.Ordinal);
}
