namespace OpsLvp.Web.Engine;

/// <summary>The engine host's part of <c>/health</c>: <c>audit</c> is <c>ok</c> or <c>failing</c>.</summary>
/// <param name="Running">The host has loaded the profile and state and is evaluating.</param>
/// <param name="LastEvaluationAt">App-clock instant of the last committed evaluation.</param>
/// <param name="Audit">"ok" or "failing".</param>
/// <param name="AuditError">The last commit error while failing.</param>
/// <param name="ProfileVersion">The profile in use.</param>
/// <param name="NotRecordingSince">App-clock instant recording stopped (storage failing), null while recording.</param>
/// <param name="Stopped">Why the engine did not start (its stored state does not match the audit chain), else null.</param>
public sealed record EngineHealth(bool Running, DateTimeOffset? LastEvaluationAt, string Audit, string? AuditError, string? ProfileVersion, DateTimeOffset? NotRecordingSince = null, string? Stopped = null);
