using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Profile;

/// <summary>
/// The aerodrome's own LVP configuration: every threshold, dwell and checklist here is a local value
/// set by the aerodrome's approved LVP instruction. Loaded from JSON by <see cref="ProfileLoader"/> and
/// checked by <c>ProfileValidator</c> (DESIGN R6). Documented in docs/profile.md.
/// </summary>
public sealed record AerodromeProfile
{
    /// <summary>Version label of this profile (recorded with every transition and export).</summary>
    public required string Version { get; init; }

    public required AerodromeInfo Aerodrome { get; init; }

    public IReadOnlyList<RunwayConfig> Runways { get; init; } = [];

    public IReadOnlyList<SensorConfig> Sensors { get; init; } = [];

    public IReadOnlyList<TeamConfig> Teams { get; init; } = [];

    public LightsConfig Lights { get; init; } = new();

    /// <summary>Maximum age of a reading per kind before it is stale (DESIGN R2).</summary>
    public IReadOnlyDictionary<ReadingKind, int> MaxAgeSeconds { get; init; } = new Dictionary<ReadingKind, int>();

    /// <summary>RVR positions whose readings govern the phase (DESIGN R3), e.g. TDZ, MID, END.</summary>
    public IReadOnlyList<RvrPosition> GoverningPositions { get; init; } = [RvrPosition.Tdz, RvrPosition.Mid, RvrPosition.End];

    /// <summary>Whether vertical visibility counts as ceiling (local practice; on by default).</summary>
    public bool VerticalVisibilityIsCeiling { get; init; } = true;

    /// <summary>Allowed clock skew for readings timed in the future, seconds (DESIGN R1).</summary>
    public int FutureSkewSeconds { get; init; } = 5;

    /// <summary>
    /// Minutes without a touch or key after which a shared tablet's actions page signs its person out, so the next
    /// person never ticks under the previous one's name (issue 13). 1 to 240; default 10.
    /// </summary>
    public int TabletIdleSignOutMinutes { get; init; } = 10;

    public required ThresholdSet Thresholds { get; init; }

    /// <summary>Transitions that need a duty manager's confirmation (DESIGN R10); the rest are automatic.</summary>
    public IReadOnlyList<TransitionRule> Confirm { get; init; } = [];

    public ChecklistSet Checklists { get; init; } = new();
}
