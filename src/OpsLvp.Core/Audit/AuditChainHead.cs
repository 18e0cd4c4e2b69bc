namespace OpsLvp.Core.Audit;

/// <summary>What the next entry needs of the last one: its sequence and hash.</summary>
public readonly record struct AuditChainHead(long Sequence, string Hash);
