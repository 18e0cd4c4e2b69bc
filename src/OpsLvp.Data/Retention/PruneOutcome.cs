namespace OpsLvp.Data.Retention;

/// <summary>
/// The result of one pruning run: what was pruned (null when nothing was due), the audit sequence that records it,
/// readings left over by an earlier run that were deleted now, and the reason when the run failed (then nothing of
/// this run was deleted).
/// </summary>
public sealed record PruneOutcome(PrunedReadings? Pruned, long? AuditSequence, long LeftoversDeleted, string? Failure)
{
    public bool Failed => Failure is not null;
}
