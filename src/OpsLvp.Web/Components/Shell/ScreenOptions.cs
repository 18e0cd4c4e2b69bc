namespace OpsLvp.Web.Components.Shell;

/// <summary>Configuration section <c>Screens</c>: how live pages prove they are live.</summary>
public sealed class ScreenOptions
{
    public const string SectionName = "Screens";

    /// <summary>
    /// How often the server sends every live page a heartbeat (real time, also in demo mode). A page that has seen
    /// no heartbeat for two intervals shows "NO LIVE DATA since …" and greys its values (wwwroot-assets/live-watch.js).
    /// Between 0.2 s and 60 s; default 2 s.
    /// </summary>
    public TimeSpan HeartbeatInterval { get; set; } = TimeSpan.FromSeconds(2);

    /// <summary>
    /// How long a tablet's cards stay in place after the last touch when the person does not scroll
    /// (Pages/Actions/TabletCards). Real time, between 1 s and 10 min; default 5 s.
    /// </summary>
    public TimeSpan TabletCardHold { get; set; } = TimeSpan.FromSeconds(5);
}
