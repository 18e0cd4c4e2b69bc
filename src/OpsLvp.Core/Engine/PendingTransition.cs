namespace OpsLvp.Core.Engine;

/// <summary>A transition the profile says needs confirmation (docs/engine.md R10).</summary>
/// <param name="From">Phase it would leave.</param>
/// <param name="To">Phase it would enter.</param>
/// <param name="ConditionMetAt">When its condition completed its dwell (the proposal instant).</param>
/// <param name="Reason">Readable reason, e.g. "RVR 09 TDZ 500 m &lt; 550 m".</param>
/// <param name="Snapshot">The condition values at the proposal instant.</param>
public sealed record PendingTransition(Phase From, Phase To, DateTimeOffset ConditionMetAt, string Reason, ConditionSnapshot Snapshot);
