namespace OpsLvp.Data.Retention;

/// <summary>
/// One export file of a pruning run as the audit entry names it: file name (in the export folder), the number of
/// readings, the first and last id, the SHA-256 of the file's bytes (lowercase hex) and the covered-readings digest of
/// its content (<see cref="OpsLvp.Core.Audit.Anchors.ReadingsDigest"/>).
/// </summary>
public sealed record ExportedReadingsFile(string Name, long Count, long FirstId, long LastId, string Sha256, string ReadingsSha256);
