namespace OpsLvp.Data.Entities;

/// <summary>
/// Row of <c>audit_entries</c> (docs/engine.md R12). <see cref="Time"/> is kept as the exact canonical text
/// (<see cref="OpsLvp.Core.Audit.AuditCanonical.TimeFormat"/>) so that a tampered value is reported by verification
/// instead of failing to load; the fixed width keeps text order equal to time order.
/// </summary>
public sealed class AuditEntryRow
{
    public long Sequence { get; set; }

    public required string Time { get; set; }

    public required string Actor { get; set; }

    public required string Kind { get; set; }

    public required string PayloadJson { get; set; }

    public required string PreviousHash { get; set; }

    public required string Hash { get; set; }
}
