namespace OpsLvp.Web.Live;

/// <summary>The aerodrome and profile a snapshot belongs to.</summary>
/// <param name="Illustrative">True when the profile's thresholds are illustrative (demo): screens say so.</param>
public sealed record AerodromeView(string Id, string Name, string TimeZone, string ProfileVersion, bool Illustrative)
{
    /// <summary>The profile's idle time after which a tablet signs its person out (<c>tabletIdleSignOutMinutes</c>).</summary>
    public int TabletIdleSignOutMinutes { get; init; } = 10;
}
