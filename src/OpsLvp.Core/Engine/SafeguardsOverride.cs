namespace OpsLvp.Core.Engine;

/// <summary>
/// A duty manager declared active while safeguards were open, with a reason (docs/engine.md R13). Kept in the state
/// and shown until the phase leaves active.
/// </summary>
/// <param name="OpenItems">The mandatory preparation items that were open at the override.</param>
public sealed record SafeguardsOverride(string Actor, string Reason, DateTimeOffset At, IReadOnlyList<string> OpenItems);
