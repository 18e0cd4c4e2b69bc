using OpsLvp.Core.Audit;
using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Engine;

/// <summary>What one evaluation of the engine host did.</summary>
/// <param name="Committed">The audit entries and the state were committed and the new state is current.</param>
/// <param name="Events">The engine's events (also when not committed, for the caller to explain).</param>
/// <param name="Entries">The audit entries as committed; empty when not committed.</param>
/// <param name="Error">Why the commit failed.</param>
public sealed record EvaluationOutcome(bool Committed, IReadOnlyList<EngineEvent> Events, IReadOnlyList<AuditEntry> Entries, string? Error);
