namespace OpsLvp.Web.Live;

/// <summary>An RVR sensor's recent course: 1-minute mean (metres) and tendency "U", "D", "N" or null when not determinable.</summary>
public sealed record SensorTrend(string SensorId, double? OneMinuteMeanM, string? Tendency);
