namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>The thresholds of one phase as the wall prints them.</summary>
public sealed record WallThresholdRow(string Phase, string Enter, string Recover, string Dwell);
