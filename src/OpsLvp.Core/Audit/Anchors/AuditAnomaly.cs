namespace OpsLvp.Core.Audit.Anchors;

/// <summary>
/// One thing found by the checks beyond the hash chain (docs/audit.md "Verification with anchors"): kinds
/// <c>truncated</c>, <c>rewritten</c>, <c>anchor_malformed</c>, <c>anchor_signature_invalid</c>,
/// <c>anchor_wrong_key</c>, <c>state_mismatch</c>, <c>readings_mismatch</c>, <c>readings_window_gap</c>.
/// </summary>
/// <param name="Kind">What was found.</param>
/// <param name="Sequence">The audit sequence it concerns, when there is one.</param>
/// <param name="AnchorLine">The anchor log line (1-based) it concerns, when there is one.</param>
/// <param name="Detail">One line for people.</param>
public sealed record AuditAnomaly(string Kind, long? Sequence, int? AnchorLine, string Detail);
