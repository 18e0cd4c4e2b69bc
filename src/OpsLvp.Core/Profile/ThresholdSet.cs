namespace OpsLvp.Core.Profile;

/// <summary>The thresholds of both graded phases.</summary>
public sealed record ThresholdSet(PhaseThresholds Preparation, PhaseThresholds Active);
