namespace OpsLvp.Web.Time;

/// <summary>Whether the built-in demo simulator (and with it the accelerated demo clock) runs.</summary>
public enum SimulatorMode
{
    /// <summary>Runs only when no real feed is configured (no <c>Feeds:Http</c> entry and no <c>Feeds:Push:ApiKeys</c>).</summary>
    Auto,
    /// <summary>Always runs.</summary>
    On,
    /// <summary>Never runs; the app uses the system clock.</summary>
    Off,
}
