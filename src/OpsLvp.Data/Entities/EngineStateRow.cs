namespace OpsLvp.Data.Entities;

/// <summary>The single row of <c>engine_state</c> (id 1): the latest engine state and the audit entry it follows.</summary>
public sealed class EngineStateRow
{
    /// <summary>Always <see cref="SingleId"/> (a check constraint enforces it).</summary>
    public int Id { get; set; } = SingleId;

    public const int SingleId = 1;

    /// <summary>Serialised <see cref="OpsLvp.Core.Engine.EngineState"/>.</summary>
    public required string StateJson { get; set; }

    /// <summary>Sequence of the last audit entry committed with this state (0 when there is none yet).</summary>
    public long AuditSequence { get; set; }

    /// <summary>Hash of the audit entry at <see cref="AuditSequence"/> when the state was written (null before the TamperEvidence migration or with an empty chain).</summary>
    public string? AuditHash { get; set; }

    /// <summary>Signature binding the state to its audit entry with the anchor key (docs/audit.md "State seal"); null when written without a sealer.</summary>
    public string? StateSignature { get; set; }

    public required string ProfileVersion { get; set; }

    public DateTimeOffset SavedAt { get; set; }
}
