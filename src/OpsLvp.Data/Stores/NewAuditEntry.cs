namespace OpsLvp.Data.Stores;

/// <summary>An audit entry to append: the store adds sequence and hashes (docs/engine.md R12).</summary>
public sealed record NewAuditEntry(string Actor, string Kind, string PayloadJson, DateTimeOffset Time);
