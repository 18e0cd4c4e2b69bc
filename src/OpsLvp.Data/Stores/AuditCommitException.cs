namespace OpsLvp.Data.Stores;

/// <summary>
/// The audit entries (and the state written with them) were not committed; nothing of the append is in the
/// database. The caller must not apply the action and must tell the user (docs/engine.md R12).
/// </summary>
public sealed class AuditCommitException(string message, Exception innerException) : Exception(message, innerException);
