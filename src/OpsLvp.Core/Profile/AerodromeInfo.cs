namespace OpsLvp.Core.Profile;

/// <summary>Identity of the aerodrome.</summary>
/// <param name="Id">Four-letter location indicator (the demo uses an invented one starting with X).</param>
/// <param name="Name">Display name.</param>
/// <param name="TimeZone">IANA time zone for local time on displays.</param>
/// <param name="Illustrative">True when thresholds are illustrative (demo); displays say so.</param>
public sealed record AerodromeInfo(string Id, string Name, string TimeZone = "UTC", bool Illustrative = false);
