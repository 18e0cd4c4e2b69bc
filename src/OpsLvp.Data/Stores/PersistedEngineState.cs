namespace OpsLvp.Data.Stores;

/// <summary>The stored engine state and the audit sequence it was committed with (0: no entry yet).</summary>
public sealed record PersistedEngineState(string StateJson, long AuditSequence, string ProfileVersion, DateTimeOffset SavedAt, string? AuditHash = null, string? StateSignature = null);
