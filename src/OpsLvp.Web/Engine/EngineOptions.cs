namespace OpsLvp.Web.Engine;

/// <summary>Configuration section <c>Engine</c>: the live engine host (docs/feeds.md, "Engine host").</summary>
public sealed class EngineOptions
{
    public const string SectionName = "Engine";

    /// <summary>Runs the engine host. Off only for tests that read the reading pipeline themselves.</summary>
    public bool Enabled { get; set; } = true;

    /// <summary>Aerodrome profile JSON; relative paths are looked up from the content root upwards.</summary>
    public string ProfilePath { get; set; } = "seed-demo/profile.json";

    /// <summary>Real time between evaluations when no reading arrives (at most 1 s, docs/engine.md R7 "live within 1 s").</summary>
    public TimeSpan TickInterval { get; set; } = TimeSpan.FromMilliseconds(500);

    /// <summary>
    /// Real time after which the state is written even when only the latest readings changed. Any change of phase,
    /// dwell timers, pending, hold, items, alarms, forecast or service marks is written at once, with its audit entries.
    /// </summary>
    public TimeSpan StateFlushInterval { get; set; } = TimeSpan.FromSeconds(10);

    /// <summary>
    /// Engine-clock time after which the readings stored since the last covering audit entry get a
    /// <c>readings_covered</c> entry of their own, when no transition or engine event covered them meanwhile
    /// (docs/audit.md "Readings covered", docs/engine.md R79). Bounds both the readings a restart digests and how long an
    /// edited readings table can go unnoticed. 1 second to 24 hours.
    /// </summary>
    public TimeSpan ReadingsCoverInterval { get; set; } = TimeSpan.FromMinutes(15);

    /// <summary>
    /// Set by an administrator to the audit head sequence named in a "state does not match the audit chain" stop, to
    /// start anyway (from the initial state; the acknowledgement is audited). docs/reliability.md "Tamper evidence".
    /// </summary>
    public long? AcknowledgeStateMismatch { get; set; }
}
